import type { Buffer } from "node:buffer";
import { EspalierError } from "../../errors.js";
import { SAMPLE_DEPTH, type Sample, SCALAR, sampleWidth } from "../shape/sample.js";
import { JsonTokenizer } from "./json-tokenizer.js";

type Container = Extract<Sample, { kind: "array" | "object" }>;

/** Builds a {@link Sample} of the JSON text it is fed, as far as it goes. */
class JsonSampler extends JsonTokenizer {
  root: Sample | undefined;
  // Open containers, and whether each keeps its members.
  private readonly stack: Container[] = [];
  private readonly keeps: boolean[] = [];
  private pendingKey = "";

  private attach(value: Sample): boolean {
    const top = this.stack.length - 1;
    if (top < 0) {
      this.root = value;
      return true;
    }
    if (!this.keeps[top]) return false;
    const parent = this.stack[top];
    const width = sampleWidth(top);
    if (parent.kind === "array") {
      if (parent.items.length >= width) return false;
      parent.items.push(value);
    } else {
      if (parent.entries.length >= width) return false;
      parent.entries.push([this.pendingKey, value]);
    }
    return true;
  }

  protected open(_i: number, object: boolean): void {
    const container: Container = object ? { kind: "object", entries: [] } : { kind: "array", items: [] };
    const kept = this.attach(container) && this.stack.length < SAMPLE_DEPTH;
    this.stack.push(container);
    this.keeps.push(kept);
  }

  protected close(_buf: Buffer, _i: number): void {
    this.stack.pop();
    this.keeps.pop();
  }

  protected nextItem(): void {}

  protected key(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    if (this.keeps[this.keeps.length - 1]) this.pendingKey = this.text(bytes, q, e, absQ);
  }

  protected stringValue(): void {
    this.attach(SCALAR);
  }

  protected number(): void {
    this.attach(SCALAR);
  }

  protected word(): void {
    this.attach(SCALAR);
  }

  protected chunkEnd(): void {}
}

/**
 * A sample of the JSON document that `bytes` starts: the first members of its containers, as far as
 * the bytes go and as far as they are JSON (a syntax error ends the sample; the loader reports it).
 */
export function sampleJson(bytes: Uint8Array): Sample | undefined {
  const sampler = new JsonSampler();
  try {
    sampler.write(bytes);
  } catch (error) {
    if (!(error instanceof EspalierError)) throw error;
  }
  return sampler.root;
}
