import { averageMoisture, dropOutliers, latestPoint, moistureRange, sensorIds } from "../src/readings";
import { ReadingPoint } from "../src/types";

function makePoint(moisture: number, at = "2026-05-01T06:00:00", sensorId = "n1-s1"): ReadingPoint {
  return { at, moisture, temperature: 21, sensorId };
}

describe("readings", () => {
  it("averages moisture", () => {
    const points = [makePoint(30), makePoint(40)];
    expect(averageMoisture(points)).toBe(35);
  });

  it("averages nothing to zero", () => {
    expect(averageMoisture([])).toBe(0);
  });

  it("finds the latest point", () => {
    const points = [makePoint(30, "2026-05-01T06:00:00"), makePoint(31, "2026-05-01T07:00:00")];
    const latest = latestPoint(points);
    expect(latest?.moisture).toBe(31);
  });

  it("drops outliers", () => {
    const points = [34, 35, 36, 35, 34, 90].map((moisture) => makePoint(moisture));
    const kept = dropOutliers(points, 2);
    expect(kept.every((point) => point.moisture < 50)).toBe(true);
  });

  it("lists sensors once", () => {
    const points = [makePoint(30, undefined, "b"), makePoint(31, undefined, "a"), makePoint(32, undefined, "b")];
    expect(sensorIds(points)).toEqual(["a", "b"]);
  });

  it("reports the moisture range", () => {
    const points = [makePoint(30), makePoint(40), makePoint(35)];
    const [lowest, highest] = moistureRange(points);
    expect(lowest).toBe(30);
    expect(highest).toBe(40);
  });
});
