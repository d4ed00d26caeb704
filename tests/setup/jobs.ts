import type { Session } from "./test-app";

/**
 * Creates a job from one of the workshop's starters through the real route (POST
 * /workshops/:id/jobs), as the maker's New job form does; returns the new job's id.
 */
export async function createJobFromStarter(
  owner: Session,
  o: {
    workshopId: string;
    customerId: string;
    title: string;
    starter?: string;
    handoverDate?: string;
    siteAddress?: string;
    postcode?: string;
    area?: string;
  },
): Promise<string> {
  const starters = (
    await owner.agent.get(`/api/workshops/${o.workshopId}/starters`).expect(200)
  ).body.starters as { id: string; name: string }[];
  const name = o.starter ?? "Alcove cabinets (pair)";
  const starter = starters.find((s) => s.name === name);
  if (!starter) throw new Error(`No starter called ${name}`);
  const res = await owner.agent
    .post(`/api/workshops/${o.workshopId}/jobs`)
    .set("X-CSRF-Token", owner.csrf)
    .send({
      title: o.title,
      customerId: o.customerId,
      siteAddress: o.siteAddress ?? "9 Example Row, Wetherfold",
      postcode: o.postcode ?? "QX9 9AB",
      area: o.area ?? "Example Row, Wetherfold",
      holidayRegion: "GB-ENG",
      starterId: starter.id,
      status: "planned",
      ...(o.handoverDate ? { handoverDate: o.handoverDate } : {}),
    });
  if (res.status !== 201)
    throw new Error(
      `Creating ${o.title} failed: ${res.status} ${JSON.stringify(res.body)}`,
    );
  return res.body.id as string;
}
