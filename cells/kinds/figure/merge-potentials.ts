import type { FigureSpec } from "../../views/figures/figure-spec";
import type { PotentialsFacts } from "../../views/figures/potentials";
import { SOURCE_COLOR, TARGET_COLOR } from "../../views/theme";

/**
 * One picture of both potentials, from the two single-side figures of
 * `potentialsFigure`: their marks together, f over the source points and g over
 * the target points. In 1-D the two lines keep their side colours and get a key;
 * in 2-D both clouds share one colour scale spanning both potentials (they are in
 * the same cost units). Notes and cautions of both, repeats dropped.
 */
export function mergePotentials(f: FigureSpec<PotentialsFacts>, g: FigureSpec<PotentialsFacts>): FigureSpec<PotentialsFacts> {
  const marks = [...((f.options.marks ?? []) as unknown[]), ...((g.options.marks ?? []) as unknown[])];
  const min = Math.min(f.facts.min, g.facts.min);
  const max = Math.max(f.facts.max, g.facts.max);
  const facts: PotentialsFacts = { shownDim: f.facts.shownDim, pointsDropped: f.facts.pointsDropped + g.facts.pointsDropped, min, max };
  const unique = (items: readonly string[]) => [...new Set(items)];
  let options = { ...f.options, marks: marks as typeof f.options.marks };
  let key = f.key;
  if (f.facts.shownDim === 1) {
    options = { ...options, y: { ...(f.options.y ?? {}), label: "potential" } };
    key = [
      { label: "f (source potential)", color: SOURCE_COLOR, shape: "line" },
      { label: "g (target potential)", color: TARGET_COLOR, shape: "line" },
    ];
  } else if (f.options.color && typeof f.options.color === "object") {
    options = { ...options, color: { ...f.options.color, domain: [min, max > min ? max : min + 1], label: "potential (f on source, g on target)" } };
  }
  return {
    ...f,
    options,
    key,
    notes: unique([...f.notes, ...g.notes].map((n) => n.replace(/^Colour shows f \(source potential\)/, "Colour shows f (source) and g (target)"))),
    cautions: unique([...f.cautions, ...g.cautions]),
    facts,
  };
}
