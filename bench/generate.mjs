// Generated notes for benches: invented, demo-style content, deterministic.
export function generatedNote(blocks, { seed = 1 } = {}) {
  let s = seed;
  const rnd = () => ((s = (s * 1103515245 + 12345) % 2147483648) / 2147483648);
  const out = ['# Generated bench note', ''];
  for (let i = 0; i < blocks; i++) {
    const b = (150 + Math.round(rnd() * 200)).toFixed(0);
    const tf = (10 + Math.round(rnd() * 10)).toFixed(0);
    const h = (300 + Math.round(rnd() * 400)).toFixed(0);
    out.push(`## Member ${i}`, '', 'Some prose about this member and its loading, written as an engineer would.', '');
    out.push(`\`\`\`shear Member ${i}`);
    out.push(`section S${i}: welded girder ${i}`);
    out.push(`  plate ${b} mm x ${tf} mm`, `  plate 8 mm x ${h} mm`, `  plate ${b} mm x ${tf} mm`);
    out.push(`V${i} = ${(50 + rnd() * 100).toFixed(1)} kN`);
    out.push(`t${i} = tau_max(S${i}, V${i})`);
    out.push(`q${i} = flow(S${i}, V${i}, S${i}.depth - ${tf} mm)`);
    out.push(`check t${i} <= 0.4 * 275 MPa`);
    out.push('```', '');
  }
  return out.join('\n');
}
