import type { StarterBody } from "../../../shared/schemas";

// Starting programmes every new workshop gets; each is editable. Lags that stand for drying or
// setting are trade rules of thumb, marked "common practice" with their usual value.
export const defaultStarters: StarterBody[] = [
  {
    name: "Alcove cabinets (pair)",
    description:
      "Base cabinets and shelves in both alcoves, new coving above, painted in.",
    tasks: [
      {
        key: "survey",
        name: "Survey & measure",
        party: "workshop",
        durationDays: 0.5,
      },
      {
        key: "first-fix",
        name: "Electrician first fix (cabinet lights)",
        party: "electrician",
        durationDays: 0.5,
        customerNote: "Power will be off in the room for the morning.",
      },
      {
        key: "carcasses",
        name: "Fix carcasses & scribes",
        party: "workshop",
        durationDays: 2,
        hazards: ["tall-unit"],
        customerNote: "Clear both alcoves and the floor in front of them.",
      },
      {
        key: "template",
        name: "Template coving",
        party: "plasterer",
        durationDays: 0.5,
        hazards: ["height"],
      },
      {
        key: "coving",
        name: "Fit coving & make good",
        party: "plasterer",
        durationDays: 1,
        hazards: ["height"],
        customerNote: "Expect dust: keep the room closed and pets out.",
      },
      { key: "doors", name: "Hang doors", party: "workshop", durationDays: 1 },
      {
        key: "second-fix",
        name: "Electrician second fix",
        party: "electrician",
        durationDays: 0.5,
      },
      {
        key: "paint",
        name: "Fill, caulk & paint",
        party: "decorator",
        durationDays: 2,
        customerNote:
          "Keep the room free of dust for painting; windows closed.",
      },
      { key: "handover", name: "Walk-round with the customer", party: "workshop", durationDays: 0 },
    ],
    links: [
      {
        from: "survey",
        to: "first-fix",
        note: "Electrical first fix before the carcasses go in (common practice).",
      },
      { from: "first-fix", to: "carcasses" },
      {
        from: "carcasses",
        to: "template",
        note: "The plasterer templates once the side scribes and top backers are fixed.",
      },
      {
        from: "template",
        to: "coving",
        lag: 2,
        note: "Coving made up from the template: about 2 working days.",
      },
      { from: "carcasses", to: "doors" },
      {
        from: "doors",
        to: "second-fix",
        note: "Electrical second fix after the doors are hung (common practice).",
      },
      {
        from: "coving",
        to: "paint",
        lag: 24,
        lagUnit: "elapsedHours",
        note: "Coving adhesive set before filling and painting: about 24 h (common practice).",
      },
      { from: "paint", to: "handover" },
      { from: "second-fix", to: "handover" },
    ],
  },
  {
    name: "Fitted wardrobe",
    description:
      "A double wardrobe: floor first, carcasses, doors, plinths and scribes, painted in.",
    tasks: [
      {
        key: "survey",
        name: "Survey & measure",
        party: "workshop",
        durationDays: 0.5,
      },
      {
        key: "first-fix",
        name: "Electrician first fix (wardrobe lighting)",
        party: "electrician",
        durationDays: 0.5,
      },
      {
        key: "floor",
        name: "Lay floor",
        party: "flooring",
        durationDays: 1,
        customerNote: "Clear the floor completely.",
      },
      {
        key: "carcasses",
        name: "Fit wardrobe carcasses",
        party: "workshop",
        durationDays: 2,
        hazards: ["tall-unit"],
      },
      {
        key: "doors",
        name: "Fit doors, plinths & scribes",
        party: "workshop",
        durationDays: 1,
      },
      {
        key: "second-fix",
        name: "Electrician second fix",
        party: "electrician",
        durationDays: 0.5,
      },
      {
        key: "paint",
        name: "Fill & paint scribes",
        party: "decorator",
        durationDays: 1,
      },
      { key: "handover", name: "Walk-round with the customer", party: "workshop", durationDays: 0 },
    ],
    links: [
      { from: "survey", to: "first-fix" },
      { from: "survey", to: "floor" },
      {
        from: "first-fix",
        to: "carcasses",
        note: "Electrical first fix before the carcasses go in (common practice).",
      },
      {
        from: "floor",
        to: "carcasses",
        note: "The floor goes down before the plinths.",
      },
      { from: "carcasses", to: "doors" },
      {
        from: "doors",
        to: "second-fix",
        note: "Electrical second fix after the doors are hung (common practice).",
      },
      {
        from: "doors",
        to: "paint",
        lag: 4,
        lagUnit: "elapsedHours",
        note: "Caulk and filler dry before painting: a few hours (common practice).",
      },
      { from: "paint", to: "handover" },
      { from: "second-fix", to: "handover" },
    ],
  },
  {
    name: "Bookcase wall",
    description:
      "Floor-to-ceiling bookcases with a skimmed wall behind, lit shelves, painted in.",
    tasks: [
      {
        key: "survey",
        name: "Survey & measure",
        party: "workshop",
        durationDays: 0.5,
      },
      {
        key: "first-fix",
        name: "Electrician first fix (shelf lights)",
        party: "electrician",
        durationDays: 0.5,
      },
      {
        key: "skim",
        name: "Skim the back wall",
        party: "plasterer",
        durationDays: 1,
        customerNote: "Expect dust and wet plaster: keep the room closed.",
      },
      {
        key: "carcasses",
        name: "Fix carcasses & scribes",
        party: "workshop",
        durationDays: 2,
        hazards: ["tall-unit", "height"],
      },
      {
        key: "paint",
        name: "Mist coat & two coats",
        party: "decorator",
        durationDays: 2,
        customerNote:
          "Keep the room free of dust for painting; windows closed.",
      },
      {
        key: "shelves",
        name: "Fit shelves & doors",
        party: "workshop",
        durationDays: 1,
      },
      {
        key: "second-fix",
        name: "Electrician second fix",
        party: "electrician",
        durationDays: 0.5,
      },
      { key: "handover", name: "Walk-round with the customer", party: "workshop", durationDays: 0 },
    ],
    links: [
      { from: "survey", to: "first-fix" },
      { from: "first-fix", to: "skim" },
      {
        from: "skim",
        to: "carcasses",
        lag: 120,
        lagUnit: "elapsedHours",
        note: "New skim dry before fixing over it: about a day per mm; a skim typically several days to a week (common practice).",
      },
      {
        from: "carcasses",
        to: "paint",
        note: "Two coats of paint on new plaster after a mist coat (NHBC Standards 2020, 9.5.7).",
      },
      {
        from: "paint",
        to: "shelves",
        lag: 4,
        lagUnit: "elapsedHours",
        note: "Water-based paint recoat: about 2–4 h at 20 °C, longer when cold or damp (common practice).",
      },
      { from: "shelves", to: "second-fix" },
      { from: "second-fix", to: "handover" },
    ],
  },
];
