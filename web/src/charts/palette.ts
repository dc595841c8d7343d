/** Series colours (distinct in lightness as well as hue) and dash patterns, so lines part without colour. */
export const INK = {
  blue: '#1f5fa8',
  orange: '#b8541a',
  teal: '#0f7b6c',
  violet: '#6b4fa0',
  slate: '#5b6472',
  red: '#a8261e',
  amber: '#8a5a00',
  grid: '#e4e1d8',
  axis: '#3b4250',
};
export const DASH = { solid: [] as number[], dashed: [6, 4], dotted: [2, 3], long: [10, 4] };
export const SHADE = { derate: 'rgba(168, 38, 30, 0.12)', interval: 'rgba(107, 79, 160, 0.12)' };
