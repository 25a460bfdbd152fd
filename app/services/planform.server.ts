import type { PlanformData } from "~/domain/step-data";
import { wingGeometry, type WingGeometry } from "~/engine";
import { runEngine } from "./engine.server";

/**
 * The derived geometry of a planform (area, span, aspect and taper ratios, MAC, panel sweeps), in
 * SI. Geometry needs no section data, so neutral section values fill the engine's station type.
 * @throws DomainError (unprocessable) naming the field when the stations do not describe a wing
 */
export function planformGeometry(stations: PlanformData["stations"]): WingGeometry {
  return runEngine(() => wingGeometry(stations.map((s) => ({ ...s, a0: 2 * Math.PI, alphaL0: 0, cmAc: 0 }))));
}
