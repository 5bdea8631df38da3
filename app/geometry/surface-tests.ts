// Scoring a flatness test from a surface's heights. The measuring length a proportional tolerance is taken
// over is the longer side of the area read (common practice: a table's flatness is stated over its length).
import { GeometryInputError } from "./errors";
import { flatnessEvaluation } from "./flatness";
import type { ProfileTest, SurfaceMeasurement, TestResult, Warning } from "./types";

export function evaluateSurface(
  test: ProfileTest,
  measurement: SurfaceMeasurement,
): { value: number; measuringLength: number; flatness: NonNullable<TestResult["flatness"]>; warnings: Warning[] } {
  if (test.method !== "flatness") {
    throw new GeometryInputError(`Test ${test.code} does not take heights over a surface.`, ["kind"]);
  }
  const reference = measurement.reference ?? "minimum-zone";
  let evaluation;
  try {
    evaluation = flatnessEvaluation(measurement.points, reference);
  } catch (error) {
    throw error instanceof GeometryInputError ? error.within("points") : error;
  }
  let minX = Infinity;
  let maxX = -Infinity;
  let minY = Infinity;
  let maxY = -Infinity;
  for (const point of measurement.points) {
    minX = Math.min(minX, point.x);
    maxX = Math.max(maxX, point.x);
    minY = Math.min(minY, point.y);
    maxY = Math.max(maxY, point.y);
  }
  const warnings: Warning[] = [];
  if (measurement.points.length < 9) {
    warnings.push({
      code: "few-stations",
      message: "Fewer than 9 places read: a surface's hollows and crowns hide between them; read a grid of at least 3 × 3.",
    });
  }
  return {
    value: evaluation.deviation,
    measuringLength: Math.max(maxX - minX, maxY - minY),
    flatness: {
      reference,
      plane: evaluation.plane,
      above: Math.max(...evaluation.residuals),
      below: Math.min(...evaluation.residuals),
    },
    warnings,
  };
}
