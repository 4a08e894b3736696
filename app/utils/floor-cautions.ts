// The two or three cautions that fit each floor action (product.md, "Cautions shown in context"); one list
// per action, shown in the form's header.
export const FLOOR_CAUTIONS = {
  swap: [
    'Truck positioned, brake set, key off before the battery comes out.',
    'Lifting equipment rated for the battery\'s weight.',
    'Battery secured in the truck after the change.',
  ],
  charge: [
    'Charger off before connecting or disconnecting.',
    'Battery cover or compartment open, vent caps in place.',
    'No smoking, flames or sparks; ventilation running.',
  ],
  water: [
    'Face shield and goggles, acid-resistant gloves and apron.',
    'Eyewash within reach.',
    'Tools and metal off the cell tops.',
  ],
  lpChange: [
    'Engine off, in the designated changing area. No smoking, flames or sparks.',
    'Gloves and eye protection on: liquid propane causes cold burns.',
    'Mount it with the relief valve pointing up (in the vapour space) and the locating pin in its hole.',
  ],
  lpRefill: [
    'Cylinder off the truck and in the filling area. No smoking, flames or sparks.',
    'Gloves and eye protection: liquid propane causes cold burns.',
  ],
  requalify: [
    'An out-of-date or damaged cylinder is not filled or fitted until it passes.',
    'A condemned cylinder never goes back in use: empty it and set it apart.',
  ],
  emissions: [
    'Run the engine for the test outdoors or with the exhaust ventilated.',
    'Keep clear of the tailpipe and hot exhaust parts.',
  ],
  co: [
    'Indoor combustion trucks need ventilation running and CO monitored.',
    'Above 200 ppm: get people out, ventilate, park the combustion trucks.',
  ],
} as const satisfies Record<string, readonly string[]>
