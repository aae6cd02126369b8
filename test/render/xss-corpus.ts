/**
 * Hostile notes. Each payload, if it ever ran, would set window.__tlPwned or open a dialog, or
 * fetch from https://attacker.invalid; the tests assert none of that happens. `inBlocksOnly` notes
 * keep their payloads inside shear blocks, so they are fair for a host that renders raw HTML in the
 * rest of the Markdown (VS Code's preview, where the CSP is the host's own net).
 */
export interface HostileNote {
  name: string;
  text: string;
  inBlocksOnly: boolean;
}

const FLAG = 'window.__tlPwned=1';
const payloads = [
  `<script>${FLAG}</script>`,
  `<img src=x onerror="${FLAG}">`,
  `"><img src=x onerror=${FLAG}>`,
  `' onmouseover='${FLAG}' x='`,
  `<svg onload="${FLAG}"><script>${FLAG}</script></svg>`,
  `<iframe srcdoc="<script>parent.__tlPwned=1</script>"></iframe>`,
  `<a href="javascript:${FLAG}">x</a>`,
  `</title><script>${FLAG}</script>`,
  `</style><script>${FLAG}</script>`,
  `<img src="https://attacker.invalid/leak.png">`,
  `<math><mtext><table><mglyph><style><img src=x onerror=alert(1)>`,
];

const katexTricks = [
  '\\href{javascript:alert(1)}{click}',
  '\\htmlData{onclick=alert(1)}{x}',
  '\\url{javascript:alert(1)}',
  '\\includegraphics{https://attacker.invalid/x.png}',
  '\\def\\a{\\a\\a}\\a',
  '\\edef\\b{\\a\\a\\a\\a\\a\\a\\a\\a\\a\\a}',
];

function block(title: string, body: string[]): string {
  return ['```shear ' + title, ...body, '```', ''].join('\n');
}

export const HOSTILE_NOTES: HostileNote[] = [
  ...payloads.map((p, i) => ({
    name: `payload ${i + 1} in titles, comments and bad lines`,
    inBlocksOnly: true,
    text: [
      `# Note`,
      '',
      block(p, [
        `section S: ${p}`,
        `  plate 100 mm x 200 mm   # ${p}`,
        `V = 10 kN  # ${p}`,
        `W = ${p}`,
        `${p}`,
        `check V <= 20 kN # ${p}`,
        `beam B: 4 m  # ${p}`,
        `  pin at 0 m`,
        `  roller at 4 m`,
        `  ${p}: udl 2 kN/m`,
      ]),
    ].join('\n'),
  })),
  ...payloads.map((p, i) => ({
    name: `payload ${i + 1} in the prose`,
    inBlocksOnly: false,
    text: [`# Title ${p}`, '', `Project: ${p}`, '', p, '', `[link](javascript:${FLAG})`, '', `<javascript:alert(1)>`, '', `![x](https://attacker.invalid/x.png)`, '', block('ok', ['V = 1 kN'])].join('\n'),
  })),
  {
    name: 'KaTeX commands in every place a note can write text',
    inBlocksOnly: true,
    text: katexTricks.map((k) => block(k, [`section S: ${k}`, '  plate 10 mm x 10 mm', `x = ${k}`, `y = 1 kN # ${k}`])).join('\n'),
  },
  {
    name: 'huge expansions and long lines',
    inBlocksOnly: true,
    text: block('long', ['x = ' + '('.repeat(200) + '1' + ')'.repeat(200), 'y = ' + '1 + '.repeat(2000) + '1', '\\def\\a{\\a\\a}\\a'.repeat(50)]),
  },
  {
    name: 'an unclosed fence of HTML',
    inBlocksOnly: true,
    text: '```shear <script>' + FLAG + '</script>\nV = 1 kN\n<style>*{background:url(https://attacker.invalid/)}</style>\n',
  },
];
