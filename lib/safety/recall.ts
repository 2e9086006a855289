/**
 * What a member is told when fuel they drew is under review (common practice for off-spec
 * biodiesel: stop using it on the road, watch the fuel filter, let a qualified mechanic judge the
 * engine). The app never says a vehicle is fine; it defers to a qualified mechanic or technician.
 */
export const RECALL_CAUTIONS: readonly string[] = [
  'Stop using this fuel in road vehicles until the co-op tells you the review is closed. If you still have some in a can, keep it closed and apart from other fuel.',
  'Watch for hard starting, rough running, loss of power, more smoke than usual or a fuel-filter or water-in-fuel warning. Check the fuel filter and drain the water separator if your vehicle has one.',
  'For heating and off-road equipment, check the fuel filter and the burner nozzle, and stop it if it runs poorly.',
  'If anything runs badly, have a qualified diesel mechanic (or heating technician) look at it. Tell them the fuel may be off-specification biodiesel and which property failed. This message is not advice about your vehicle: follow your maker’s and your mechanic’s guidance.',
];

/** The one line on every recall screen and e-mail that defers to professionals. */
export const RECALL_DEFERENCE =
  'Defer to a qualified mechanic or technician and to your vehicle maker’s guidance; the co-op cannot judge your engine from here.'; // common practice
