// The demo's second workshop (issue 14): "Saltmarsh & Pike Kitchens" of Ettlesby, a fictional
// village near Wetherfold, which books the same plasterer as Hollin & Vane. It knows him by its
// own record ("Ashby Plastering", its own contact details) linked to the same Sitecue account,
// so Dev Ashby's "Your visits" and "My calendar" hold both workshops' visits, and each workshop
// sees the other's only as busy. Invented like the first: "QX" postcodes, 01632 960 numbers.
import type { EntityManager } from "typeorm";
import type { User } from "../../server/modules/users/users.entity";
import { addDefaultStarters } from "../../server/modules/starters/starters.service";
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

/** The second demo workshop, its owner (README lists the same) and its one job. */
export const demoSecondWorkshop = {
  name: "Saltmarsh & Pike Kitchens",
  owner: { email: "ines@saltpike.example.test", name: "Ines Saltmarsh" },
  /** The workshop's own name for the demo plasterer's business. */
  tradeBusinessName: "Ashby Plastering",
  jobTitle: "Larder & island, farmhouse kitchen",
  /** Its bookings of the plasterer, in weekdays from today (the first workshop's are on 1 and 4). */
  plastererDays: { skim: 9, makeGood: 14 },
} as const;

/** Loads the second workshop inside the demo's transaction; `plasterer` is the demo trade's account. */
export async function loadSecondWorkshop(
  m: EntityManager,
  day: (n: number) => string,
  plasterer: User,
  password: string,
): Promise<void> {
  const d = demoSecondWorkshop;
  const workshop = await buildWorkshop(m, { name: d.name, town: "Ettlesby" });
  const owner = await buildUser(m, { ...d.owner, password });
  await buildMember(m, workshop, owner, "owner");
  await addDefaultStarters(m, workshop.id);
  const record = await buildTrade(m, workshop, {
    kind: "plasterer",
    businessName: d.tradeBusinessName,
    contactName: plasterer.name,
    email: plasterer.email,
    phone: "01632 960 114",
  });
  await linkTradeUser(m, record, plasterer);
  const customer = await buildCustomer(m, workshop, {
    name: "Hal Greenaway",
    email: "hal.greenaway@example.test",
    phone: "01632 960 826",
  });
  const job = await buildJob(m, workshop, customer, {
    title: d.jobTitle,
    siteAddress: "Tithe Barn Farm, Mere Lane, Ettlesby",
    postcode: "QX7 3TB",
    area: "Mere Lane, Ettlesby",
    status: "planned",
    handoverDate: day(20),
    accessNotes: "Farm gate on Mere Lane; park in the yard, not on the verge.",
  });
  const survey = await buildTask(m, job, {
    name: "Survey & measure",
    party: "workshop",
    durationDays: 0.5,
    actualStart: day(-8),
    actualFinish: `${day(-8)}T12:00`,
  });
  const skim = await buildTask(m, job, {
    name: "Skim larder walls",
    party: "plasterer",
    durationDays: 1,
    customerNote: "Clear the old larder shelves before the plasterer comes.",
  });
  const fit = await buildTask(m, job, {
    name: "Fit larder & island",
    party: "workshop",
    durationDays: 2,
    hazards: ["tall-unit"],
  });
  const makeGood = await buildTask(m, job, {
    name: "Make good around the island",
    party: "plasterer",
    durationDays: 0.5,
  });
  const handover = await buildTask(m, job, {
    name: "Walk-round with the customer",
    party: "workshop",
    durationDays: 0,
  });
  await buildLink(m, survey, skim);
  // Skim coat dry before the carcasses go against it: about two days (common practice).
  await buildLink(m, skim, fit, { lag: 48, lagUnit: "elapsedHours" });
  await buildLink(m, fit, makeGood);
  await buildLink(m, makeGood, handover);
  await buildBooking(m, skim, record, {
    state: "confirmed",
    sentAt: new Date(Date.now() - 5 * 86_400_000),
    start: `${day(d.plastererDays.skim)}T08:00`,
    finish: `${day(d.plastererDays.skim)}T16:30`,
    arrivalWindow: "all-day",
  });
  await buildBooking(m, makeGood, record, {
    state: "sent",
    sentAt: new Date(Date.now() - 1 * 86_400_000),
    start: `${day(d.plastererDays.makeGood)}T08:00`,
    finish: `${day(d.plastererDays.makeGood)}T12:00`,
    arrivalWindow: "morning",
  });
}
