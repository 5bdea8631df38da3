// The usual cautions for geometry tests on a machine, shown before the readings form and printed on the
// certificate. The machine's manual, local rules and licensed practice come first.
export const SAFETY_CAUTIONS: readonly string[] = [
  "Rotating spindle and chuck: take the chuck key out before every start, keep guards in place, and never reach across a turning spindle.",
  "No gloves, loose sleeves, ties, jewellery or loose hair near rotating parts; turn the spindle by hand for indicator readings wherever the test allows.",
  "Lock the machine out and tag it at the isolator before adjusting spindle bearings, gibs, levelling screws or anything inside the guards.",
  "Test mandrels, faceplates and chucks are heavy: use lifting aids, support them while fitting, and keep feet clear.",
  "Numerically controlled axes move on their own under a program: run test programs with the guards closed and a hand near the emergency stop, first at reduced feed, with the instrument's cables clear of the travel; never look into a laser interferometer's beam.",
  "Leave rigging and moving the machine to qualified riggers, and electrical connection to a licensed electrician.",
];

export const SAFETY_DEFERENCE =
  "The machine's manual, local rules and licensed practice come first; stop any test you judge unsafe.";
