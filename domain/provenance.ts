/** Version of backstop's models, stamped on every result; bump it when a model's numbers change. */
export const MODEL_VERSION = "0.1.0";

/** The caution every analysis result carries. */
export const CAUTION =
  "Engineering estimates from models and datasheet parameters. Protection stages carry fault energy and heat: " +
  "verify the final design on hardware and against the applicable standards; local codes and licensed practice take precedence.";
