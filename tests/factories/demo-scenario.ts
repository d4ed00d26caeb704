// The demo scenario: an invented workshop, "Hollin & Vane Joinery" of Wetherfold (a fictional
// town; postcodes use the unused "QX" area, phone numbers the 01632 960 range set aside for
// drama). Dates are placed relative to "today" so the demo always shows work in progress.
import type { DataSource } from "typeorm";
import {
  buildBooking,
  buildCustomer,
  buildJob,
  buildLink,
  buildMember,
  buildTask,
  buildTrade,
  buildUser,
  buildWorkshop,
  linkTradeUser,
} from "./builders";
import { addDefaultStarters } from "../../server/modules/starters/starters.service";
import type { Storage } from "../../server/infra/storage/storage";
import { loadDemoDrawings } from "./demo-drawings";
import { setDemoReadMarkers, writeDemoThread } from "./demo-thread";
import { loadSecondWorkshop } from "./demo-second-workshop";

export const DEMO_PASSWORD = "sitecue-demo";
/** The demo workshop's name (the seed makes it; tests look it up by it). */
export const DEMO_WORKSHOP_NAME = "Hollin & Vane Joinery";

/** One demo account per role (README lists the same). */
export const demoAccounts = {
  owner: { email: "martha@hollinvane.example.test", name: "Martha Hollin" },
  fitter: { email: "joel@hollinvane.example.test", name: "Joel Vane" },
  trade: { email: "dev@ashbyplaster.example.test", name: "Dev Ashby" },
  customer: { email: "rosa.pennick@example.test", name: "Rosa Pennick" },
} as const;

export const demoJobTitles = {
  alcoves: "Alcove cabinets, front room",
  wardrobe: "Double wardrobe, main bedroom",
  bookcase: "Bookcase wall, study",
} as const;

/** YYYY-MM-DD of `today` moved by `n` weekdays (Saturdays and Sundays skipped). */
export function weekdaysFrom(today: string, n: number): string {
  const d = new Date(`${today}T12:00:00Z`);
  while ([0, 6].includes(d.getUTCDay())) d.setUTCDate(d.getUTCDate() + 1);
  let left = Math.abs(n);
  const step = n < 0 ? -1 : 1;
  while (left > 0) {
    d.setUTCDate(d.getUTCDate() + step);
    if (![0, 6].includes(d.getUTCDay())) left--;
  }
  return d.toISOString().slice(0, 10);
}

/** Loads the whole demo scenario in one transaction (then the thread's read markers); with `storage`, also the demo drawing. */
export async function loadDemoScenario(
  ds: DataSource,
  today: string,
  opts: { storage?: Storage } = {},
): Promise<void> {
  const day = (n: number) => weekdaysFrom(today, n);
  /** An instant n days before now (when invitations went out). */
  const daysAgo = (n: number) => new Date(Date.now() - n * 86_400_000);
  const readMarkers = await ds.transaction(async (m) => {
    const workshop = await buildWorkshop(m, {
      name: DEMO_WORKSHOP_NAME,
      town: "Wetherfold",
    });
    const owner = await buildUser(m, {
      ...demoAccounts.owner,
      password: DEMO_PASSWORD,
    });
    const fitter = await buildUser(m, {
      ...demoAccounts.fitter,
      password: DEMO_PASSWORD,
    });
    await buildMember(m, workshop, owner, "owner");
    await buildMember(m, workshop, fitter, "fitter");
    await addDefaultStarters(m, workshop.id);

    const plasterer = await buildTrade(m, workshop, {
      kind: "plasterer",
      businessName: "Ashby Plaster & Coving",
      contactName: "Dev Ashby",
      email: demoAccounts.trade.email,
      phone: "01632 960 114",
    });
    const decorator = await buildTrade(m, workshop, {
      kind: "decorator",
      businessName: "Kestrel Decorating",
      contactName: "Nell Brook",
      email: "nell@kestreldecorating.example.test",
      phone: "01632 960 271",
    });
    const electrician = await buildTrade(m, workshop, {
      kind: "electrician",
      businessName: "Brightwire Electrical",
      contactName: "Sam Orchard",
      email: "sam@brightwire.example.test",
      phone: "01632 960 388",
    });
    const flooring = await buildTrade(m, workshop, {
      kind: "flooring",
      businessName: "Tarn Floors",
      contactName: "Ola Tarn",
      email: "ola@tarnfloors.example.test",
      phone: "01632 960 452",
      workingWeekdays: [1, 2, 3, 4, 5, 6],
    });
    const tradeUser = await buildUser(m, {
      ...demoAccounts.trade,
      password: DEMO_PASSWORD,
    });
    await linkTradeUser(m, plasterer, tradeUser);

    const rosaUser = await buildUser(m, {
      ...demoAccounts.customer,
      password: DEMO_PASSWORD,
    });
    const rosa = await buildCustomer(m, workshop, {
      name: demoAccounts.customer.name,
      email: demoAccounts.customer.email,
      phone: "01632 960 519",
      userId: rosaUser.id,
    });
    const tom = await buildCustomer(m, workshop, {
      name: "Tom Fennimore",
      email: "tom.fennimore@example.test",
      phone: "01632 960 633",
    });
    const ada = await buildCustomer(m, workshop, {
      name: "Ada Linwood",
      email: "ada.linwood@example.test",
      phone: "01632 960 747",
    });

    // Job 1 — an alcove pair in a Victorian terrace, on site now.
    const alcoves = await buildJob(m, workshop, rosa, {
      title: demoJobTitles.alcoves,
      siteAddress: "14 Larkspur Terrace, Wetherfold",
      postcode: "QX4 2LT",
      area: "Larkspur, Wetherfold",
      status: "on-site",
      handoverDate: day(8),
      accessNotes:
        "Park on Larkspur Terrace (permit in the front window). Key safe by the door: code given on confirmation. Cat indoors: keep the front-room door shut.",
    });
    const survey = await buildTask(m, alcoves, {
      name: "Survey & measure",
      party: "workshop",
      durationDays: 0.5,
      actualStart: day(-15),
      actualFinish: `${day(-15)}T12:00`,
    });
    const firstFix = await buildTask(m, alcoves, {
      name: "Electrician first fix (cabinet lights)",
      party: "electrician",
      durationDays: 0.5,
      actualStart: day(-3),
      actualFinish: `${day(-3)}T12:00`,
      customerNote: "Power will be off in the front room for the morning.",
    });
    const carcasses = await buildTask(m, alcoves, {
      name: "Fix carcasses & scribes",
      party: "workshop",
      durationDays: 2,
      actualStart: day(-1),
      hazards: ["tall-unit"],
      customerNote: "Clear both alcoves and the floor in front of them.",
      internalNote:
        "Left alcove wall out of plumb by 12 mm at the top: scribe allowance on the left side.",
    });
    const template = await buildTask(m, alcoves, {
      name: "Template coving",
      party: "plasterer",
      durationDays: 0.5,
      hazards: ["height"],
    });
    const coving = await buildTask(m, alcoves, {
      name: "Fit coving & make good",
      party: "plasterer",
      durationDays: 1,
      hazards: ["height"],
      customerNote: "Expect dust: keep the room closed and pets out.",
    });
    const doors = await buildTask(m, alcoves, {
      name: "Hang doors",
      party: "workshop",
      durationDays: 1,
      notEarlierThan: day(2),
      internalNote: "Sprayed doors due from the finisher.",
    });
    const secondFix = await buildTask(m, alcoves, {
      name: "Electrician second fix",
      party: "electrician",
      durationDays: 0.5,
    });
    const paint = await buildTask(m, alcoves, {
      name: "Fill, caulk & paint",
      party: "decorator",
      durationDays: 2,
      customerNote: "Keep the room free of dust for painting; windows closed.",
    });
    const handover = await buildTask(m, alcoves, {
      name: "Walk-round with the customer",
      party: "workshop",
      durationDays: 0,
    });
    await buildLink(m, survey, firstFix);
    await buildLink(m, firstFix, carcasses);
    await buildLink(m, carcasses, template);
    await buildLink(m, template, coving, { lag: 2 });
    await buildLink(m, carcasses, doors);
    await buildLink(m, doors, secondFix);
    // Coving adhesive set before filling and painting: about 24 h (common practice).
    await buildLink(m, coving, paint, { lag: 24, lagUnit: "elapsedHours" });
    await buildLink(m, paint, handover);
    await buildLink(m, secondFix, handover);
    await buildBooking(m, firstFix, electrician, {
      state: "confirmed",
      sentAt: daysAgo(9),
      start: `${day(-3)}T08:00`,
      finish: `${day(-3)}T12:00`,
      arrivalWindow: "morning",
      sequence: 0,
    });
    await buildBooking(m, template, plasterer, {
      state: "sent",
      sentAt: daysAgo(2),
      start: `${day(1)}T08:00`,
      finish: `${day(1)}T12:00`,
      arrivalWindow: "morning",
    });
    await buildBooking(m, coving, plasterer, {
      state: "confirmed",
      sentAt: daysAgo(6),
      start: `${day(4)}T08:00`,
      finish: `${day(4)}T16:30`,
      arrivalWindow: "range",
      arrivalFrom: "08:00",
      arrivalTo: "09:00",
    });
    await buildBooking(m, secondFix, electrician, {
      state: "sent",
      sentAt: daysAgo(4),
      start: `${day(3)}T12:00`,
      finish: `${day(3)}T16:30`,
      arrivalWindow: "afternoon",
    });
    await buildBooking(m, paint, decorator, {
      state: "confirmed",
      sentAt: daysAgo(6),
      start: `${day(6)}T08:00`,
      finish: `${day(7)}T16:30`,
      arrivalWindow: "all-day",
    });

    // Job 2 — a double wardrobe in a first-floor flat, planned.
    const wardrobe = await buildJob(m, workshop, tom, {
      title: demoJobTitles.wardrobe,
      siteAddress: "Flat 3, 22 Millrace Court, Wetherfold",
      postcode: "QX2 7MR",
      area: "Millrace, Wetherfold",
      status: "planned",
      handoverDate: day(22),
      siteWeekdays: [1, 2, 3, 4],
      accessNotes:
        "Entry phone for flat 3; lift to the first floor. No parking on the court: use the pay car park on Weir Street.",
    });
    const wSurvey = await buildTask(m, wardrobe, {
      name: "Survey & measure",
      party: "workshop",
      durationDays: 0.5,
      actualStart: day(-6),
      actualFinish: `${day(-6)}T12:00`,
    });
    const wFirstFix = await buildTask(m, wardrobe, {
      name: "Electrician first fix (wardrobe lighting)",
      party: "electrician",
      durationDays: 0.5,
    });
    const wFloor = await buildTask(m, wardrobe, {
      name: "Lay bedroom floor",
      party: "flooring",
      durationDays: 1,
      customerNote: "Clear the bedroom floor completely.",
    });
    const wCarcasses = await buildTask(m, wardrobe, {
      name: "Fit wardrobe carcasses",
      party: "workshop",
      durationDays: 2,
      hazards: ["tall-unit"],
    });
    const wPlinths = await buildTask(m, wardrobe, {
      name: "Fit plinths, doors & scribes",
      party: "workshop",
      durationDays: 1,
    });
    const wHandover = await buildTask(m, wardrobe, {
      name: "Walk-round with the customer",
      party: "workshop",
      durationDays: 0,
    });
    await buildLink(m, wSurvey, wFirstFix);
    await buildLink(m, wFirstFix, wCarcasses);
    await buildLink(m, wFloor, wCarcasses);
    await buildLink(m, wCarcasses, wPlinths);
    await buildLink(m, wPlinths, wHandover);
    await buildBooking(m, wFirstFix, electrician, {
      state: "confirmed",
      start: `${day(10)}T08:00`,
      finish: `${day(10)}T12:00`,
      arrivalWindow: "morning",
    });
    await buildBooking(m, wFloor, flooring, {
      state: "draft",
      start: `${day(11)}T08:00`,
      finish: `${day(11)}T16:30`,
      arrivalWindow: "all-day",
    });

    // Job 3 — a bookcase wall, still under survey.
    const bookcase = await buildJob(m, workshop, ada, {
      title: demoJobTitles.bookcase,
      siteAddress: "5 Orchard Rise, Wetherfold",
      postcode: "QX5 1DR",
      area: "Orchard Rise, Wetherfold",
      status: "survey",
      handoverDate: null,
      accessNotes: "Side gate; ring the bell at the back door.",
    });
    await buildTask(m, bookcase, {
      name: "Survey & measure",
      party: "workshop",
      durationDays: 0.5,
      notEarlierThan: day(3),
      hazards: [],
    });

    // A second workshop booking the same plasterer (demo-second-workshop.ts, issue 14).
    await loadSecondWorkshop(m, day, tradeUser, DEMO_PASSWORD);

    // A few days of the thread (demo-thread.ts): every audience on the alcoves, the workshop's own
    // notes on the wardrobe.
    return writeDemoThread(
      m,
      { alcoves, wardrobe },
      {
        owner,
        fitter,
        trade: tradeUser,
        customer: rosaUser,
        tradeBusinessName: plasterer.businessName,
      },
      day,
    );
  });
  await setDemoReadMarkers(ds, readMarkers);
  // The demo drawing needs the bucket; without one (most API tests) the scenario has no drawings.
  if (opts.storage)
    await loadDemoDrawings(
      ds,
      opts.storage,
      demoJobTitles.alcoves,
      demoAccounts.owner.email,
    );
}
