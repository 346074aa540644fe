/** What changed between a saved analysis and the same parameters run on today's catalogue. */
import type {
  AnalysisResults,
  Difference,
  RerunComparison,
  SessionInputs,
} from '../../shared/analyses';

function difference(before: number | null, after: number | null): Difference {
  return { before, after, change: before !== null && after !== null ? after - before : null };
}

function detectionsOf(inputs: SessionInputs): number {
  return inputs.detections.reduce((a, d) => a + d[3], 0);
}

function modelEstimates(results: AnalysisResults): Map<string, number | null> {
  const closed = results.closed;
  const out = new Map<string, number | null>();
  if (!closed) return out;
  for (const m of [...closed.models, ...closed.otherModels]) out.set(m.model, m.N);
  return out;
}

/** The differences a re-run reports: N̂ per model, D̂, S, detections, who appeared or vanished. */
export function compareRuns(
  saved: { inputs: SessionInputs; results: AnalysisResults },
  current: { inputs: SessionInputs; results: AnalysisResults },
): RerunComparison['differences'] {
  const before = modelEstimates(saved.results);
  const after = modelEstimates(current.results);
  const models = [...new Set([...before.keys(), ...after.keys()])].map((model) => ({
    model,
    ...difference(before.get(model) ?? null, after.get(model) ?? null),
  }));
  const savedIds = new Set(saved.inputs.individuals.map((i) => i.id));
  const currentIds = new Set(current.inputs.individuals.map((i) => i.id));
  const savedSightings = new Set(saved.inputs.sightingIds);
  const currentSightings = new Set(current.inputs.sightingIds);
  return {
    S: difference(saved.inputs.individuals.length, current.inputs.individuals.length),
    detections: difference(detectionsOf(saved.inputs), detectionsOf(current.inputs)),
    sightings: difference(saved.inputs.sightingIds.length, current.inputs.sightingIds.length),
    occasions: difference(saved.inputs.occasions.length, current.inputs.occasions.length),
    densityPer100km2: difference(
      saved.results.secr?.densityPer100km2 ?? null,
      current.results.secr?.densityPer100km2 ?? null,
    ),
    models,
    individualsAppeared: current.inputs.individuals.filter((i) => !savedIds.has(i.id)),
    individualsDisappeared: saved.inputs.individuals.filter((i) => !currentIds.has(i.id)),
    sightingsAppeared: current.inputs.sightingIds.filter((id) => !savedSightings.has(id)),
    sightingsDisappeared: saved.inputs.sightingIds.filter((id) => !currentSightings.has(id)),
  };
}
