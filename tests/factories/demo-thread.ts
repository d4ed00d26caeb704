// The demo's thread: a few days of plain trade talk on the alcove job (every audience) and the
// wardrobe job (the workshop's own), written through the thread module's own writer
// (`insertThreadMessage`) so each row is what posting in the app stores, and read markers set
// through `markRead`, as the job page sets them. Everything is invented; no message carries
// contact details. No notice e-mails are owed: in the story they went out days ago.
import type { DataSource, EntityManager } from "typeorm";
import { DateTime } from "luxon";
import type { ThreadAudience } from "../../shared/schemas";
import {
  insertThreadMessage,
  noteDay,
} from "../../server/modules/thread/thread-notes";
import {
  ThreadMessage,
  type ThreadAuthorRole,
} from "../../server/modules/thread/thread.entity";
import { markRead } from "../../server/modules/thread/thread.service";
import { loadSessionUser } from "../../server/modules/users/users.service";
import type { Job } from "../../server/modules/jobs/jobs.entity";
import type { User } from "../../server/modules/users/users.entity";

/** Who wrote a demo message, labelled as the thread's `authorFor` labels a poster. */
type Author = {
  userId: string;
  name: string;
  label: string;
  role: ThreadAuthorRole;
};

/** The texts the tests look for (and check each audience keeps to itself). */
export const demoThreadTexts = {
  /** Alcoves, Whole job, the owner to everyone, three weekdays back. */
  weekAhead: "The electrician's first fix for the cabinet lights is done",
  /** Alcoves, Whole job, the customer's reply that evening. */
  customerReply: "Parking is tight on the terrace this week",
  /** Alcoves, Trades & workshop, the owner asks the plasterer about the coving. */
  covingProfile: "can you match the original cove",
  /** Alcoves, Trades & workshop, the plasterer answers. */
  covingAnswer: "I can run a length to match",
  /** Alcoves, Workshop only, the fitter to the owner. */
  fitterLeftWall: "left alcove wall leans out at the top",
  /** Alcoves, Workshop only, the owner to the fitter. */
  ownerFinisher: "The finisher says the doors will be ready",
  /** Alcoves, Whole job, the owner's update yesterday: the customer's one unread. */
  carcassesUp: "Both carcasses are up and fixed",
  /** Alcoves, Trades & workshop, the plasterer yesterday evening: unread by the owner. */
  scribeGap: "If the top gap on the left ends up nearer 20 mm",
  /** Alcoves, Workshop only, the fitter yesterday evening: unread by the owner. */
  fitterShims: "Left side scribed",
  /** Wardrobe, Workshop only, the fitter after the survey. */
  wardrobeSurvey: "Survey done at Millrace Court",
  /** Wardrobe, Workshop only, the owner's answer. */
  wardrobePlan: "floor goes down first",
} as const;

/** Demo messages per job and audience, and each person's unread count once loaded. */
export const demoThreadCounts = {
  alcoves: { job: 3, trades: 3, workshop: 3 },
  wardrobe: { job: 0, trades: 0, workshop: 2 },
  /** Unread on the alcove job: the owner has not read the newest two; the others are up to date. */
  alcovesUnread: { owner: 2, fitter: 0, trade: 0, customer: 1 },
} as const;

interface DemoThreadPeople {
  owner: User;
  fitter: User;
  trade: User;
  customer: User;
  tradeBusinessName: string;
}

interface ReadMarker {
  userId: string;
  jobId: string;
  seq: number;
}

/**
 * Writes the demo's messages in `m` (the scenario's transaction), oldest first so `seq` order is
 * time order, and returns the read markers to set once it has committed (`setDemoReadMarkers`).
 */
export async function writeDemoThread(
  m: EntityManager,
  jobs: { alcoves: Job; wardrobe: Job },
  people: DemoThreadPeople,
  day: (n: number) => string,
): Promise<ReadMarker[]> {
  const as = (u: User, label: string, role: Author["role"]): Author => ({
    userId: u.id,
    name: u.name,
    label,
    role,
  });
  const martha = as(people.owner, "Workshop", "workshop");
  const joel = as(people.fitter, "Workshop", "workshop");
  const dev = as(people.trade, people.tradeBusinessName, "trade");
  const rosa = as(people.customer, "Customer", "customer");
  const T = demoThreadTexts;
  const { alcoves, wardrobe } = jobs;

  const lines: {
    job: Job;
    n: number;
    time: string;
    audience: ThreadAudience;
    author: Author;
    text: string;
  }[] = [
    {
      job: wardrobe,
      n: -6,
      time: "15:20",
      audience: "workshop",
      author: joel,
      text: `${T.wardrobeSurvey}. The bedroom ceiling drops about 10 mm towards the window, so the right-hand top scribe wants extra. The lift takes the 2.2 m sides standing up, just.`,
    },
    {
      job: wardrobe,
      n: -5,
      time: "08:45",
      audience: "workshop",
      author: martha,
      text: `Thanks. The new ${T.wardrobePlan}, so the carcasses sit on the finished boards; the electrician comes before that for the wardrobe lighting. I'll book the floor once Tom has picked the boards.`,
    },
    {
      job: alcoves,
      n: -3,
      time: "15:40",
      audience: "job",
      author: martha,
      text: `${T.weekAhead} and the power is back on in the front room. We're back on ${noteDay(day(-1))} to fix the carcasses and scribe them to the walls (two days). Once they're in, the plasterer templates the coving, then fits it on ${noteDay(day(4))}.`,
    },
    {
      job: alcoves,
      n: -3,
      time: "19:05",
      audience: "job",
      author: rosa,
      text: `Thanks, I'll have both alcoves cleared before then. ${T.customerReply} with the roadworks at the top, so it may be easier round the corner on Foxglove Lane; the permit is in the front window as before. I'm at work all day, so use the key safe and let yourselves in. Please keep the front-room door shut for the cat.`,
    },
    {
      job: alcoves,
      n: -2,
      time: "10:15",
      audience: "trades",
      author: martha,
      text: `Dev, for the coving over the alcoves: ${T.covingProfile} on the chimney breast, 120 deep, across the cabinet tops? We're leaving a 15 mm scribe gap between the tops and the ceiling.`,
    },
    {
      job: alcoves,
      n: -2,
      time: "13:30",
      audience: "trades",
      author: dev,
      text: `${T.covingAnswer} from the elevation. 15 mm is fine as long as the top fillers sit flush with the cabinet faces. If the ceiling dips, leave the fillers loose at the top and I'll mark them when I template.`,
    },
    {
      job: alcoves,
      n: -2,
      time: "16:50",
      audience: "workshop",
      author: joel,
      text: `Went back over the survey: the ${T.fitterLeftWall}, 12 mm, so I've cut the left scribe fillers wide in the shop. Have we heard from the finisher about the doors?`,
    },
    {
      job: alcoves,
      n: -1,
      time: "08:05",
      audience: "workshop",
      author: martha,
      text: `${T.ownerFinisher} for ${noteDay(day(2))}, so Hang doors stays where it is. Leave the top fillers loose for Dev, as he asked.`,
    },
    {
      job: alcoves,
      n: -1,
      time: "17:10",
      audience: "job",
      author: martha,
      text: `${T.carcassesUp} today. Tomorrow we scribe the fillers to the walls and fit the tops. The dust sheets stay down and the front-room door stays shut.`,
    },
    {
      job: alcoves,
      n: -1,
      time: "18:40",
      audience: "trades",
      author: dev,
      text: `${T.scribeGap}, I'd rather you brought it down before I template: up to 15 mm the coving hides it. I'll confirm the template visit tonight.`,
    },
    {
      job: alcoves,
      n: -1,
      time: "19:15",
      audience: "workshop",
      author: joel,
      text: `${T.fitterShims}: the top gap is 14 mm at the back, so Dev is fine. Right side and the tops first thing tomorrow. We're nearly out of 4 mm packers.`,
    },
  ];

  const seqs: { job: Job; author: Author; seq: number }[] = [];
  for (const l of lines) {
    const row = await insertThreadMessage(m, {
      workshopId: l.job.workshopId,
      jobId: l.job.id,
      audience: l.audience,
      kind: "message",
      text: l.text,
      author: l.author,
    });
    // Posting stamps "now"; the story happened over the last few working days (site time).
    const createdAt = DateTime.fromISO(`${day(l.n)}T${l.time}`, {
      zone: l.job.timeZone,
    }).toJSDate();
    await m.update(ThreadMessage, { seq: row.seq }, { createdAt });
    seqs.push({ job: l.job, author: l.author, seq: Number(row.seq) });
  }
  /** The last message this person wrote on the job: they had the thread open then. */
  const lastBy = (job: Job, who: Author) =>
    Math.max(
      ...seqs
        .filter((s) => s.job === job && s.author === who)
        .map((s) => s.seq),
    );
  return [
    // The owner read everything up to her update yesterday; the plasterer's and the fitter's
    // evening messages wait for her. The wardrobe's are read.
    { userId: martha.userId, jobId: alcoves.id, seq: lastBy(alcoves, martha) },
    {
      userId: martha.userId,
      jobId: wardrobe.id,
      seq: lastBy(wardrobe, martha),
    },
    // The fitter wrote last: read through. The plasterer read up to his own evening message.
    { userId: joel.userId, jobId: alcoves.id, seq: lastBy(alcoves, joel) },
    { userId: joel.userId, jobId: wardrobe.id, seq: lastBy(wardrobe, martha) },
    { userId: dev.userId, jobId: alcoves.id, seq: lastBy(alcoves, dev) },
    // The customer read up to her reply; yesterday's update is new to her.
    { userId: rosa.userId, jobId: alcoves.id, seq: lastBy(alcoves, rosa) },
  ];
}

/** Sets each marker as the job page does (`markRead`: never past what that person can see). */
export async function setDemoReadMarkers(
  ds: DataSource,
  markers: ReadMarker[],
): Promise<void> {
  for (const r of markers) {
    const loaded = await loadSessionUser(ds.manager, r.userId);
    if (!loaded) throw new Error(`Demo user ${r.userId} is missing`);
    await markRead(ds, loaded.actor, r.jobId, r.seq);
  }
}
