import { W } from "./trend-geometry";

/** A panel's rotated axis title, beside the left or right axis. */
export function axisLabel(text: string, top: number, height: number, side: "left" | "right") {
  return (
    <text
      transform={`translate(${side === "left" ? 12 : W - 8} ${top + height / 2}) rotate(${side === "left" ? -90 : 90})`}
      textAnchor="middle"
      className="fill-ink text-[11px] font-medium"
    >
      {text}
    </text>
  );
}
