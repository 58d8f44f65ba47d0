import { deficit, glasshouses, searchZones, sortZones, thirstyZones, totalLitres } from "../src/zones";
import { Zone } from "../src/types";

function makeZone(zoneId: string, moisture: number, targetMoisture = 40, crop = "tomato"): Zone {
  return {
    zoneId,
    name: `zone ${zoneId}`,
    crop,
    glasshouse: zoneId.startsWith("n") ? "north" : "south",
    targetMoisture,
    moisture,
    litres: moisture,
    nextWatering: null,
    slots: [],
  };
}

describe("zones", () => {
  it("lists glasshouses once", () => {
    const zones = [makeZone("n1", 30), makeZone("s1", 30), makeZone("n2", 30)];
    expect(glasshouses(zones)).toEqual(["north", "south"]);
  });

  it("puts the driest zone first", () => {
    const zones = [makeZone("n1", 38), makeZone("s1", 20)];
    const thirsty = thirstyZones(zones);
    expect(thirsty[0].zoneId).toBe("s1");
  });

  it("never reports a negative deficit", () => {
    expect(deficit(makeZone("n1", 50))).toBe(0);
  });

  it("adds up litres", () => {
    const zones = [makeZone("n1", 10), makeZone("s1", 5)];
    expect(totalLitres(zones)).toBe(15);
  });

  it("searches by crop", () => {
    const zones = [makeZone("n1", 10, 40, "basil"), makeZone("s1", 5)];
    const found = searchZones(zones, "BASIL");
    expect(found.map((zone) => zone.zoneId)).toEqual(["n1"]);
  });

  it("sorts by moisture", () => {
    const zones = [makeZone("n1", 30), makeZone("s1", 10)];
    const sorted = sortZones(zones, "moisture");
    expect(sorted[0].zoneId).toBe("s1");
  });
});
