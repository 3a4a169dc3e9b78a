/**
 * What registering a robot takes (POST /api/robots), shared by the route and the roster's
 * register form: a name, the drive, the sensors as PROTOCOL.md's `hello` describes them,
 * an optional floorplan (the default one otherwise) and whether it is simulated.
 */
import { z } from "zod";
import { SensorSchema } from "../protocol/robot-link";
import { DRIVES } from "../vocabulary";

/** Most sensors a robot may announce, as in `hello`. */
export const MAX_SENSORS = 16;

export const RegisterRobotSchema = z.object({
  name: z.string().trim().min(1, "give the robot a name").max(80, "at most 80 characters"),
  drive: z.enum(DRIVES),
  sensors: z
    .array(SensorSchema)
    .max(MAX_SENSORS, `at most ${MAX_SENSORS} sensors`)
    .refine((list) => new Set(list.map((s) => s.id)).size === list.length, { message: "sensor ids must be unique" }),
  floorplanId: z.number().int().positive().optional(),
  simulated: z.boolean().optional(),
});

export type RegisterRobotInput = z.infer<typeof RegisterRobotSchema>;
