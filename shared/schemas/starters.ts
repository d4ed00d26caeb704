import { z } from "zod";
import { idSchema, partySchema } from "./common";
import {
  durationSchema,
  hazardSchema,
  lagSchema,
  lagUnitSchema,
  linkKindSchema,
  refineLag,
} from "./programme";

export const starterTaskSchema = z.object({
  key: z
    .string()
    .trim()
    .min(1)
    .max(40)
    .regex(/^[a-z0-9-]+$/, "Use lower-case letters, digits and -"),
  name: z.string().trim().min(1, "Give the task a name").max(160),
  party: partySchema,
  durationDays: durationSchema,
  hazards: z.array(hazardSchema).max(3).default([]),
  customerNote: z.string().max(1000).default(""),
});
export type StarterTask = z.output<typeof starterTaskSchema>;

export const starterLinkSchema = z
  .object({
    from: z.string().min(1).max(40),
    to: z.string().min(1).max(40),
    kind: linkKindSchema.default("FS"),
    lag: lagSchema.default(0),
    lagUnit: lagUnitSchema.default("workingDays"),
    /** Why this lag: a trade default, marked "common practice" where it is one. */
    note: z.string().max(300).default(""),
  })
  .superRefine(refineLag);
export type StarterLink = z.output<typeof starterLinkSchema>;

export const starterBodySchema = z
  .object({
    name: z.string().trim().min(1, "Give the starter a name").max(120),
    description: z.string().max(300).default(""),
    tasks: z
      .array(starterTaskSchema)
      .min(1, "A starter needs at least one task")
      .max(60),
    links: z.array(starterLinkSchema).max(120).default([]),
  })
  .superRefine((b, ctx) => {
    const keys = new Set<string>();
    b.tasks.forEach((t, i) => {
      if (keys.has(t.key))
        ctx.addIssue({
          code: "custom",
          path: ["tasks", i, "key"],
          message: "Each task key once",
        });
      keys.add(t.key);
    });
    b.links.forEach((l, i) => {
      if (!keys.has(l.from))
        ctx.addIssue({
          code: "custom",
          path: ["links", i, "from"],
          message: `No task with key "${l.from}"`,
        });
      if (!keys.has(l.to))
        ctx.addIssue({
          code: "custom",
          path: ["links", i, "to"],
          message: `No task with key "${l.to}"`,
        });
    });
  });
export type StarterBody = z.input<typeof starterBodySchema>;

export const starterResponseSchema = z.object({
  id: idSchema,
  name: z.string(),
  description: z.string(),
  tasks: z.array(starterTaskSchema),
  links: z.array(starterLinkSchema),
});
export type StarterResponse = z.infer<typeof starterResponseSchema>;
