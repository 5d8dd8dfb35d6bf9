import { colourHex } from '../colour/colourMap.js';
import { reportPalette as c } from '../colour/reportPalette.js';
import { sequentialColourMap } from '../colour/sequentialColourMap.js';

/** A CSS gradient through the sequential map, for the masthead rule. */
function mapGradient(): string {
  const stops: string[] = [];
  for (let k = 0; k <= 8; k++) stops.push(`${colourHex(sequentialColourMap, Math.round((k / 8) * (sequentialColourMap.size - 1)))} ${(k * 12.5).toFixed(1)}%`);
  return `linear-gradient(90deg, ${stops.join(', ')})`;
}

/** The report's style sheet: cool paper, slate ink, one colour per model, figures on white cards. */
export function reportStyle(): string {
  return `
:root { --ground: ${c.ground}; --card: ${c.card}; --rule: ${c.rule}; --ink: ${c.ink}; --muted: ${c.muted};
  --smooth: ${c.smooth}; --perturbed: ${c.perturbed}; --caution: ${c.caution}; --caution-tint: ${c.cautionTint}; --truth: ${c.truth}; }
* { box-sizing: border-box; }
html { background: var(--ground); }
body { margin: 0; color: var(--ink); font: 15px/1.5 'Inter', 'Segoe UI', 'Helvetica Neue', Arial, sans-serif; }
.masthead { background: var(--ink); color: #f4f6f9; padding: 22px 0 18px; }
.masthead::after { content: ''; display: block; height: 5px; margin-top: 18px; background: ${mapGradient()}; }
.wrap { max-width: 1240px; margin: 0 auto; padding: 0 28px; }
.brand { font-size: 12px; letter-spacing: 0.22em; text-transform: uppercase; opacity: 0.75; }
.masthead h1 { margin: 4px 0 6px; font-size: 27px; font-weight: 650; letter-spacing: -0.01em; }
.masthead .meta { margin: 0; font-size: 13px; opacity: 0.8; }
.masthead .meta code { color: inherit; }
main.wrap { padding-top: 22px; padding-bottom: 40px; }
section.card, .verdict, .caution { background: var(--card); border: 1px solid var(--rule); border-radius: 7px; padding: 20px 24px; margin: 0 0 18px; }
h2 { font-size: 18px; margin: 0 0 12px; font-weight: 650; }
h2 .num-tag { color: var(--muted); font-weight: 500; font-size: 13px; margin-left: 6px; }
h3 { font-size: 15px; margin: 18px 0 6px; font-weight: 650; }
h3 .muted, .muted { color: var(--muted); font-weight: 400; }
.verdict { display: grid; grid-template-columns: minmax(240px, 320px) 1fr; gap: 24px; align-items: center; border-top: 5px solid var(--ink); }
.verdict.favoured { border-top-color: var(--perturbed); }
.verdict.not-favoured { border-top-color: var(--smooth); }
.verdict .label { display: block; font-size: 12px; letter-spacing: 0.08em; text-transform: uppercase; color: var(--muted); }
.verdict .big { display: block; font-size: 40px; font-weight: 680; font-variant-numeric: tabular-nums; line-height: 1.15; }
.verdict .big small { font-size: 22px; font-weight: 500; color: var(--muted); }
.verdict p { margin: 4px 0; }
.verdict .reading { font-size: 18px; font-weight: 600; }
.badge { display: inline-block; padding: 1px 9px; border-radius: 20px; font-size: 12px; font-weight: 600; color: #fff; vertical-align: 2px; }
.badge.favoured { background: var(--perturbed); }
.badge.not-favoured { background: var(--smooth); }
.badge.not-evidence { background: var(--muted); }
.caution { display: grid; grid-template-columns: 34px 1fr; gap: 12px; background: var(--caution-tint); border-color: var(--caution); border-left: 6px solid var(--caution); }
.caution .mark { width: 30px; height: 30px; border-radius: 50%; background: var(--caution); color: var(--ink); font-weight: 800; display: grid; place-items: center; font-size: 18px; }
.caution p { margin: 2px 0; }
.caution strong { letter-spacing: 0.04em; }
nav.contents { display: flex; flex-wrap: wrap; gap: 6px 18px; margin: 0 0 18px; font-size: 14px; }
nav.contents a { color: var(--ink); text-decoration: none; border-bottom: 2px solid var(--rule); }
nav.contents a:hover { border-bottom-color: var(--perturbed); }
.narrow { max-width: 860px; }
#parameter-table td:first-child, #prior-table td:first-child { white-space: nowrap; }
table { border-collapse: collapse; width: 100%; font-size: 13.5px; margin: 4px 0 8px; }
th { text-align: left; font-weight: 600; font-size: 11.5px; letter-spacing: 0.05em; text-transform: uppercase; color: var(--muted); border-bottom: 1.5px solid var(--ink); padding: 5px 8px; vertical-align: bottom; }
th.group { text-align: center; border-bottom: 2px solid currentColor; }
th.group.smooth { color: var(--smooth); }
th.group.perturbed { color: var(--perturbed); }
td { padding: 5px 8px; border-bottom: 1px solid var(--rule); vertical-align: top; }
tbody tr:hover td { background: rgba(120, 130, 150, 0.06); }
.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
.key-value td:first-child { color: var(--muted); width: 46%; }
.key-value td.num { text-align: left; }
td.quoted { font-weight: 700; color: var(--ink); background: rgba(60, 100, 170, 0.07); }
.not-favoured td.quoted { outline: 1.5px solid var(--smooth); }
.component { color: var(--muted); font-size: 12px; }
.absent { color: var(--muted); font-style: italic; }
.tag { display: inline-block; font-size: 10.5px; padding: 0 6px; border-radius: 3px; letter-spacing: 0.04em; text-transform: uppercase; }
.tag.free { background: #e8eef7; color: var(--smooth); }
.tag.held { background: #eeeeee; color: var(--muted); }
.tag.warn, td.warn { color: #8a3b00; }
.tag.warn { background: var(--caution-tint); border: 1px solid var(--caution); }
.tag.verdict-confirmed { background: var(--perturbed); color: #ffffff; }
.tag.verdict-disfavoured { background: var(--smooth); color: #ffffff; }
.tag.verdict-inconclusive { background: var(--caution-tint); border: 1px solid var(--caution); color: var(--ink); }
.tag.verdict-not-evidence, .tag.verdict-not-confirmed, .tag.claim-not-evidence { background: #eeeeee; border: 1px solid var(--muted); color: var(--ink); }
.tag.claim-detected { background: var(--perturbed); color: #ffffff; }
.tag.claim-not-detected { background: var(--smooth); color: #ffffff; }
.tag.misfit { background: var(--caution-tint); border: 1px solid var(--caution); color: #8a3b00; }
.tag.fits { background: #e6f1e8; color: #2f6b3a; }
.verdict.not-evidence { border-top-color: var(--muted); }
.place { font-size: 12px; text-align: center; }
.place.in68 { color: #2f6b3a; }
.place.in95 { color: #7a6200; }
.place.out { color: #a0301e; font-weight: 700; }
.swatch { display: inline-block; width: 10px; height: 10px; border-radius: 2px; margin-right: 6px; vertical-align: 0; }
.swatch.smooth { background: var(--smooth); }
.swatch.perturbed { background: var(--perturbed); }
.note { color: var(--muted); font-size: 13.5px; margin: 4px 0 8px; }
figure { margin: 8px 0 14px; }
figure .art { overflow-x: auto; }
figure svg { display: block; max-width: 100%; height: auto; }
figcaption { font-size: 13px; color: var(--muted); margin-top: 4px; max-width: 80ch; }
figcaption a { color: var(--muted); }
.image-grid { display: grid; grid-template-columns: repeat(auto-fill, minmax(280px, 1fr)); gap: 10px 14px; }
.image-grid figure { margin: 0; }
.image-grid figcaption { font-size: 12px; }
.row-label { grid-column: 1 / -1; font-size: 12px; letter-spacing: 0.08em; text-transform: uppercase; color: var(--muted); border-bottom: 1px solid var(--rule); padding-bottom: 2px; margin-top: 6px; }
.notices li { color: #8a3b00; }
.files { columns: 2 320px; font-size: 13.5px; padding-left: 18px; }
.files a { color: var(--ink); }
.maps { display: grid; grid-template-columns: auto 1fr; gap: 6px 16px; align-items: center; font-size: 13px; }
.maps img { width: 320px; height: 16px; image-rendering: pixelated; border: 1px solid var(--rule); display: block; }
footer { color: var(--muted); font-size: 12px; text-align: center; padding: 0 0 30px; }
@media (max-width: 760px) { .verdict { grid-template-columns: 1fr; } }
@media print { .masthead { background: none; color: var(--ink); } section.card, .verdict, .caution { break-inside: avoid; } }
`;
}
