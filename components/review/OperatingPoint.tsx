/** The operating point: node voltages and the devices' currents, voltages and dissipation. */
import { DEVICE_WORDS, NODE_WORDS } from "@/lib/design/op-words";
import type { OpResult } from "@/lib/sim";
import { formatEng } from "@/lib/units/eng";
import { formatQuantity } from "@/lib/units/quantity";


export function OperatingPoint({ op }: { op: OpResult }) {
  const nodes = Object.entries(op.nodes).filter(([n]) => !n.startsWith("cab"));
  return (
    <div className="grid gap-4 md:grid-cols-2" data-testid="review-op">
      <table className="w-full self-start border-collapse text-sm">
        <thead><tr className="border-b border-hairline text-left text-xs text-ink-muted"><th className="py-1 font-medium">Node</th><th className="py-1 font-medium">What it is</th><th className="py-1 text-right font-medium">Voltage</th></tr></thead>
        <tbody>
          {nodes.map(([n, v]) => (
            <tr key={n} className="border-b border-hairline/60"><td className="num py-0.5">{n}</td><td className="py-0.5 pr-2 text-xs text-ink-muted">{NODE_WORDS[n] ?? ""}</td><td className="num whitespace-nowrap py-0.5 text-right">{formatQuantity(v, "V", 4)}</td></tr>
          ))}
        </tbody>
      </table>
      <table className="w-full self-start border-collapse text-sm">
        <thead><tr className="border-b border-hairline text-left text-xs text-ink-muted"><th className="py-1 font-medium">Device</th><th className="py-1 font-medium">Operating point</th></tr></thead>
        <tbody>
          {Object.entries(op.devices).map(([name, d]) => (
            <tr key={name} className="border-b border-hairline/60 align-top">
              <td className="num whitespace-nowrap py-0.5 pr-3">{name}{DEVICE_WORDS[name] && <span className="block font-sans text-xs text-ink-muted">{DEVICE_WORDS[name]}</span>}</td>
              <td className="num py-0.5 text-xs">
                {d.kind === "bjt" && `IC ${formatEng(d.ic, "A")}, IB ${formatEng(d.ib, "A")}, VBE ${formatEng(d.vbe, "V")}, VCE ${formatEng(d.vce, "V")}, P ${formatEng(d.power, "W")}, ${d.region}`}
                {d.kind === "mosfet" && `ID ${formatEng(d.id, "A")}, VGS ${formatEng(d.vgs, "V")}, VDS ${formatEng(d.vds, "V")}, P ${formatEng(d.power, "W")}, ${d.region}`}
                {d.kind === "opamp" && `out ${formatEng(d.vout, "V")}, ${formatEng(d.iout, "A")}${d.limiting ? ", limiting" : ""}`}
                {d.kind === "diode" && `ID ${formatEng(d.id, "A")}, VD ${formatEng(d.vd, "V")}, P ${formatEng(d.power, "W")}`}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
