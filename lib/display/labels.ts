// How each measure is named on screen. "pH" keeps its case everywhere.
export type MeasureKind = "ph" | "ec" | "temp";

export const MEASURE_NAME: Record<MeasureKind, string> = { ph: "pH", ec: "EC", temp: "Temperature" };
export const MEASURE_SHORT: Record<MeasureKind, string> = { ph: "pH", ec: "EC", temp: "Temp" };
