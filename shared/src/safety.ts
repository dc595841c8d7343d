/**
 * The caution printed wherever output can lead to work on a vehicle. One text, used by the CLI, the
 * reports and the dashboard.
 */
export const SAFETY_CAUTION = [
  'Safety: cooling systems hold hot coolant under pressure — never open a hot system; electric fans can',
  'start on their own with the vehicle off; battery-electric and fuel-cell vehicles carry high voltage, and',
  'fuel-cell vehicles hydrogen. These findings support, and never replace, inspection by qualified',
  "technicians following the vehicle maker's service procedures and local regulations.",
].join('\n');
