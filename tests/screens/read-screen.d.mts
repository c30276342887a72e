/** Types of read-screen.mjs (see there). */
export declare const ANSI: RegExp;
export declare function checkText(
  text: string,
  options: {
    budget: number;
    width?: number;
    legend?: boolean;
    key?: boolean;
    kind?: "summary" | "diff";
    graph?: boolean;
    noted?: (room: number | undefined) => void;
    partial?: () => void;
  },
): string[];
export declare function checkJson(text: string, budget: number): string[];
