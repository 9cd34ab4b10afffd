import { z } from "zod";

const driveAt = z.object({
  inputV: z.number(),
  startMarginV: z.number().optional(),
  gateSourceV: z.number().optional(),
  gateDriveMarginV: z.number().optional(),
});
const profileSample = z.object({
  timeS: z.number(),
  supplyV: z.number(),
  mode: z.string(),
  loadV: z.number(),
  lossW: z.number(),
  tjC: z.number(),
});
export const reviewStartUp = z
  .object({
    atMinSupply: driveAt,
    atProfileMin: driveAt
      .optional()
      .meta({ description: "the same at the start-up profile's lowest point (with a profile)" }),
    profiles: z
      .array(
        z.object({
          ambientC: z.number(),
          result: z.object({
            samples: z
              .array(profileSample)
              .readonly()
              .optional()
              .meta({ description: "the profile's samples in time order, when the review was asked for curves" }),
            minLoadV: z.number().meta({ description: "the lowest load voltage over the samples", unit: "V" }),
            maxTjC: z.number().meta({ description: "the highest junction temperature over the samples", unit: "°C" }),
            bodyDiodeTimeS: z.number(),
            dropoutTimeS: z.number(),
            thermalShutdownAtS: z.number().optional().meta({
              description:
                "an integrated switch with thermalShutdownC: when its junction first reached the shutdown along the profile (the switch then off, counted as dropout: latched for the rest, or until cooled by the auto-retry hysteresis). With datasheetMax.currentLimitMinA the samples, load voltage and dropout are at the minimum limit, this instant and maxTjC at whichever of it and the typical limit heats more",
              unit: "s",
            }),
            thermalModel: z.string(),
            sampleCount: z.number().int().meta({ description: "how many samples the profile was solved at" }),
            lowestLoad: profileSample.meta({ description: "the first sample at the lowest load voltage" }),
            hottest: profileSample.meta({ description: "the first sample at the highest junction temperature" }),
          }),
        }),
      )
      .readonly(),
    inChatterBand: z.boolean().meta({
      description:
        "a corner's supply lies in the chatter band at the start threshold: running, the source drop pulls the stage input below the start voltage; below start, it is at or above it (the rule start-no-chatter reads it as startChatter)",
    }),
    chatter: z
      .object({
        corner: z.number().int().meta({ description: "index of the first such corner" }),
        startV: z.number().meta({ description: "the control's start voltage", unit: "V" }),
        runningInputV: z.number().meta({ description: "stage input with the control running", unit: "V" }),
        belowStartInputV: z.number().meta({ description: "stage input with the control below start", unit: "V" }),
      })
      .optional(),
  })
  .meta({
    description:
      "drive at the lowest supply; the start-up profile per ambient (its figures and extreme samples; every sample when the review was asked for curves); whether a corner sits in the start threshold's chatter band",
  });
