import { envelopeVersionsChartOptions } from "~/charts/comparisons";
import { Chart } from "~/components/charts/chart";
import { Panel } from "~/components/ui/page-header";
import { formatChange } from "~/domain/comparisons";
import { ENVELOPE_EXTREMES, EXTREME_LABELS, type EnvelopeExtreme, type ReportComparison } from "~/domain/report-comparison";
import { STEPS } from "~/domain/steps";
import { shownChange } from "~/domain/input-fields";
import { formatNumber, fromSI, unitSymbol, unitSystemWords, type UnitSystem } from "~/domain/units";
import { formatUtc } from "~/utils/format";

const quantityOf = (k: EnvelopeExtreme): "force" | "moment" => (k.startsWith("shear") ? "force" : "moment");

/** The two versions, named with their issue time, input hash and engine version. */
export function VersionsCompared({ c }: { c: ReportComparison }) {
  return (
    <Panel title="The two versions" className="mb-5">
      <table className="w-full text-sm tabular" aria-label="The two versions compared">
        <thead className="text-xs text-ink-muted">
          <tr>
            <th className="py-1 pr-3 text-left" />
            <th className="py-1 pr-3 text-left">Report</th>
            <th className="py-1 pr-3 text-left">Issued</th>
            <th className="py-1 pr-3 text-left">Input hash</th>
            <th className="py-1 text-left">Engine</th>
          </tr>
        </thead>
        <tbody>
          {([["Earlier", c.from], ["Later", c.to]] as const).map(([label, v]) => (
            <tr key={label} className="border-t border-line">
              <td className="py-1 pr-3 font-semibold">{label}</td>
              <td className="py-1 pr-3">
                {v.reportNumber} · version {v.version}
              </td>
              <td className="py-1 pr-3">{formatUtc(new Date(v.issuedAt))}</td>
              <td className="py-1 pr-3">
                <code className="text-xs">{v.inputHash.slice(0, 16)}…</code>
              </td>
              <td className="py-1">{v.engineVersion}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </Panel>
  );
}

/** Changed inputs, root loads and the envelope per station, earlier → later. */
export function ComparisonTables({ c, units }: { c: ReportComparison; units: UnitSystem }) {
  const show = (k: EnvelopeExtreme, si: number) => (Number.isFinite(si) ? formatNumber(fromSI(units, quantityOf(k), si), 5) : "—");
  const change = (k: EnvelopeExtreme, before: number, after: number) =>
    Number.isFinite(before) ? formatChange(fromSI(units, quantityOf(k), after - before), fromSI(units, quantityOf(k), after)) : "—";
  const root = c.stations[0];
  return (
    <>
      <Panel title={`Inputs that changed (${c.inputs.length})`} className="mb-5">
        {c.inputs.length === 0 ? (
          <p className="text-sm">No input changed between the two versions.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-sm tabular" aria-label="Inputs that changed">
              <thead className="text-xs text-ink-muted">
                <tr>
                  <th className="py-1 pr-3 text-left">Step</th>
                  <th className="py-1 pr-3 text-left">Field</th>
                  <th className="py-1 pr-3 text-left">Version {c.from.version}</th>
                  <th className="py-1 text-left">Version {c.to.version}</th>
                </tr>
              </thead>
              <tbody>
                {c.inputs.map((x, i) => {
                  const shown = shownChange(x, units);
                  return (
                    <tr key={i} className="border-t border-line align-top">
                      <td className="py-1 pr-3">{STEPS.find((s) => s.key === x.step)?.label ?? x.step}</td>
                      <td className="py-1 pr-3">{shown.field}</td>
                      <td className="max-w-80 break-words py-1 pr-3">{shown.before}</td>
                      <td className="max-w-80 break-words py-1">{shown.after}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
        <p className="mt-2 text-xs text-ink-muted">
          Values in {unitSystemWords(units)}, converted from the stored SI values. Load cases are matched by their id, other rows by position.
          {c.casesAdded.length ? ` Cases added: ${c.casesAdded.join(", ")}.` : ""}
          {c.casesRemoved.length ? ` Cases removed: ${c.casesRemoved.join(", ")}.` : ""}
        </p>
      </Panel>
      {root ? (
        <Panel title="Root loads" className="mb-5">
          <table className="w-full text-sm tabular" aria-label="Root loads of the envelope in both versions">
            <thead className="text-xs text-ink-muted">
              <tr>
                <th className="py-1 pr-3 text-left">Envelope extreme at the root</th>
                <th className="py-1 pl-3 text-right">Version {c.from.version}</th>
                <th className="py-1 pl-3 text-right">Version {c.to.version}</th>
                <th className="py-1 pl-3 text-right">Change</th>
                <th className="py-1 pl-3 text-left">Critical case</th>
              </tr>
            </thead>
            <tbody>
              {ENVELOPE_EXTREMES.map((k) => (
                <tr key={k} className="border-t border-line">
                  <td className="py-1 pr-3">
                    {EXTREME_LABELS[k]} [{unitSymbol(units, quantityOf(k))}]
                  </td>
                  <td className="py-1 pl-3 text-right">{show(k, root.before[k])}</td>
                  <td className="py-1 pl-3 text-right">{show(k, root.after[k])}</td>
                  <td className="py-1 pl-3 text-right">{change(k, root.before[k], root.after[k])}</td>
                  <td className="py-1 pl-3">
                    {root.casesBefore[k]} → {root.casesAfter[k]}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </Panel>
      ) : null}
      <Panel title="Envelope at each station" className="mb-5">
        <p className="mb-2 text-xs text-ink-muted">
          {c.interpolated
            ? `The versions have different output stations: version ${c.from.version}'s envelope is read at version ${c.to.version}'s stations by linear interpolation.`
            : `Version ${c.to.version}'s value and, below it, the change from version ${c.from.version}.`}
        </p>
        <div className="overflow-x-auto">
          <table className="w-full text-sm tabular" aria-label="Envelope extremes per station, later version and change">
            <thead className="text-xs text-ink-muted">
              <tr>
                <th className="py-1 pr-3 text-right">y [{unitSymbol(units, "length")}]</th>
                {ENVELOPE_EXTREMES.map((k) => (
                  <th key={k} className="py-1 pl-3 text-right">
                    {EXTREME_LABELS[k]} [{unitSymbol(units, quantityOf(k))}]
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {c.stations.map((st) => (
                <tr key={st.y} className="border-t border-line">
                  <td className="py-1 pr-3 text-right">{formatNumber(fromSI(units, "length", st.y), 4)}</td>
                  {ENVELOPE_EXTREMES.map((k) => (
                    <td key={k} className="py-1 pl-3 text-right">
                      {show(k, st.after[k])}
                      <span className="block text-xs text-ink-muted">{change(k, st.before[k], st.after[k])}</span>
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Panel>
    </>
  );
}

/** Shear, bending and torsion envelopes of both versions overlaid. */
export function EnvelopeOverlays({ c, units, drawings }: { c: ReportComparison; units: UnitSystem; drawings: Record<"shear" | "bending" | "torsion", string> | null }) {
  const options = envelopeVersionsChartOptions(c, units);
  return (
    <div className="grid grid-cols-1 gap-4 xl:grid-cols-3">
      {(["shear", "bending", "torsion"] as const).map((kind) => {
        return (
          <Panel key={kind}>
            <Chart
              option={options[kind]}
              svg={drawings?.[kind]}
              label={`${kind} envelope of versions ${c.from.version} and ${c.to.version}`}
              fileName={`envelope-${kind}-v${c.from.version}-v${c.to.version}`}
            />
          </Panel>
        );
      })}
    </div>
  );
}
