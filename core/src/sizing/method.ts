/** The method behind each figure of the sizing result, with its source: served with the result and printed in reports. */
export interface MethodNote {
  topic: string;
  text: string;
  source: string;
}

export const SIZING_METHOD: readonly MethodNote[] = Object.freeze([
  {
    topic: 'Rating formula',
    text: 'Q = k · A_net · ITD, ITD = coolant at the radiator inlet − ambient air. k is per m² of net frontal area and lumps fin geometry, air and coolant flow.',
    source: 'Simplified radiator rating formula, common practice',
  },
  {
    topic: 'Field k',
    text: 'Per trip and band (ram: ≥ 60 km/h, fan ≤ 20 %; fan: ≤ 20 km/h, fan ≥ 80 %), the median of 60-s near-steady windows with the thermostat fully open (trips with sensor flags left out), heat rejected = heat generated − C·dT/dt, each window referred to the band reference (80 km/h fan 0; standstill fan 100 %) with k ∝ v_face^n. Vehicle field k = median of its trips with the distribution-free 95 % interval of the median; ratio to the bench k at the same reference.',
    source:
      'Order-statistic median interval (Conover, Practical Nonparametric Statistics, 3rd ed. 1999); air-side k ∝ v^n, n 0.4–0.8 (common practice)',
  },
  {
    topic: 'Duty cycle',
    text: 'Heat into the coolant = max(traction power, 0) × coolant share ÷ drivetrain efficiency, each sample held until the next (at most 10 s). Time-weighted percentiles by speed band and ambient band, read from histograms of 1 % relative bin width (±0.5 %), so memory does not grow with the data.',
    source:
      'Heat from traction power, coolant share and drivetrain efficiency (thermargin docs/methods.md §2); log-binned histograms as in HDR histograms',
  },
  {
    topic: 'Recorded derates',
    text: 'Events are runs of derate = 1 within a trip. Energy not delivered = ∫ max(P_demand − P, 0) dt over derated time, P_demand = exponentially weighted mean traction power (60 s time constant) up to the event: an estimate that takes the load leading into the event as what the driver kept asking for. Onset heat = that mean as heat.',
    source: 'Our estimate; the telemetry does not carry the demanded power',
  },
  {
    topic: 'Fouling rate',
    text: 'Theil–Sen lines of trip k against days and against km since each radiator cleaning (fan band also since each fan repair; both since coolant service or sensor replacement), as a share of the line’s k at the interval start. Loss per month (30.44 days) and per 1000 km; median over intervals. Time to inspection = (1 − threshold ratio) ÷ rate, threshold the policy’s health ratio or the k at which the design margin reaches the inspect margin, whichever comes first. A straight line is the conservative reading of fouling that levels off. Trips after the health assessment names a cause other than fouling are left out until the maintenance that renews the band: a fan fault from the fan band, a coolant-side loss or a suspect sensor from both.',
    source: 'Theil (1950), Sen (1968); asymptotic fouling, Kern & Seaton (1959)',
  },
  {
    topic: 'Fouling allowance and required area',
    text: 'Allowance for a planned cleaning interval: L/(1 − L), L = fitted loss over the interval, so a fouled core still meets the design point at the end of it; above 100 % (k halved within one interval: more than fouling; common practice plans 10–25 %) the fit is not used and the reason is given. A_req = Q_design / (k_field · (T_limit − T_amb,design)) · (1 + allowance), k_field the clean field k moved to the design air condition. The design check’s margins differ from the analysed margin only by what they name: the margin now (the governing band’s current level, as analyze reports it), the installed area with the named k and no allowance, and with the named allowance.',
    source: 'The rating formula solved for area, common practice (thermargin docs/methods.md §3)',
  },
  {
    topic: 'What if',
    text: 'Each trip’s recorded heat replayed through a lumped loop, C·dT/dt = Q − kA·(T − T_amb), solved exactly per sample, with the trip’s own field k (else the latest earlier trip’s, else the bench k) at the sample’s speed and fan duty (fan taken at full within 5 K of the limit), the recorded ambient raised and/or the limit lowered. The thermostat holds a warm loop at its opening temperature. Reaching the limit starts a derate, which lasts until the loop is 2 K below the limit (release hysteresis); the heat refused, C·(T − T_limit), is converted to traction energy by η ÷ coolant share. The recorded conditions are replayed too, as a check against the recorded derates. Recorded power is already limited where the vehicle really derated, so the replay understates those events.',
    source: 'Lumped-capacity loop: heat rejected = heat generated − C·dT/dt (thermargin docs/methods.md §6)',
  },
  {
    topic: 'Drivetrain comparison',
    text: 'Wheel power from the road-load equation on the fleet’s own duty: mass, CdA and Crr fitted per vehicle to its samples (tractive force P/v by least squares on ½ρv², g, acceleration and 1/v for the auxiliaries), its typical moving speed and its hot day (95th percentile of its trips’ hottest ambient), the median over vehicles; figures given on the command line win, and what the data cannot give is a car at 125 km/h on a 40 °C day. Heat to coolant from each preset: engine one-third rule (120 °C limit), battery-electric 0.93 per stage for battery, inverter and motor (80 °C), fuel cell 0.60 stack with 0.93 battery charging and the same chain (80 °C). Area at equal k.',
    source:
      'Road load: Gillespie, Fundamentals of Vehicle Dynamics (SAE 1992), ch. 4; mass from drive data by least squares, e.g. Vahidi, Stefanopoulou & Peng (2005), Vehicle System Dynamics 43(1); drivetrain figures: common practice',
  },
]);
