/**
 * A block: one unbreakable piece of the report's flow (a heading, a paragraph, one table row,
 * one formula, one figure …) with the facts the page breaker needs.
 */
import type { ReactElement } from "react";
import type { FlowBlock } from "../lib/reports/paginate";

export interface Block extends Omit<FlowBlock, "height"> {
  /** Stable React key. */
  key: string;
  /** What is printed. */
  el: ReactElement;
}
