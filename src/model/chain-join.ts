/**
 * Between the labels of a chain of only children printed on one line (`services / ledger / src`); a
 * chain copied from such a line reads back as a focus (focus/printed-chain.ts).
 */
export const CHAIN_JOIN = " / ";
