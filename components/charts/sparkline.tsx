/** A small trend line of values (nulls are gaps) with a zero line; decorative beside its number, so hidden from readers. */
export function Sparkline({ values, width = 96, height = 28 }: { values: readonly (number | null)[]; width?: number; height?: number }) {
  const finite = values.filter((value): value is number => value !== null && Number.isFinite(value));
  if (finite.length < 2) return <span className="text-xs text-tremor-content dark:text-dark-tremor-content">—</span>;
  const low = Math.min(0, ...finite);
  const high = Math.max(0, ...finite);
  const span = high - low || 1;
  const x = (index: number) => (values.length === 1 ? width / 2 : (index / (values.length - 1)) * (width - 2) + 1);
  const y = (value: number) => height - 2 - ((value - low) / span) * (height - 4);
  let path = "";
  values.forEach((value, index) => {
    if (value === null || !Number.isFinite(value)) return;
    const previous = index > 0 ? values[index - 1] : null;
    path += `${previous === null || previous === undefined || !Number.isFinite(previous) ? "M" : "L"}${x(index).toFixed(1)},${y(value).toFixed(1)}`;
  });
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} aria-hidden="true" className="inline-block align-middle">
      <line x1={0} x2={width} y1={y(0)} y2={y(0)} className="stroke-slate-300 dark:stroke-slate-600" strokeDasharray="2 2" strokeWidth={1} />
      <path d={path} fill="none" className="stroke-pine-600 dark:stroke-pine-300" strokeWidth={1.6} />
    </svg>
  );
}
