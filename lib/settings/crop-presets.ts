// Target-band presets per crop (DOMAIN.md section 4: common practice, from memory; growers edit them).
// EC in µS/cm as stored; solution temperature 18–22 °C for every crop (DOMAIN.md section 4).
export const CROP_PRESETS = {
  "leafy greens": { phMin: 5.5, phMax: 6.5, ecMinUs: 800, ecMaxUs: 1200 },
  "basil and herbs": { phMin: 5.5, phMax: 6.5, ecMinUs: 1000, ecMaxUs: 1600 },
  strawberry: { phMin: 5.5, phMax: 6.2, ecMinUs: 1000, ecMaxUs: 1500 },
  "tomato (fruiting)": { phMin: 5.5, phMax: 6.5, ecMinUs: 2000, ecMaxUs: 3500 },
  cucumber: { phMin: 5.5, phMax: 6.0, ecMinUs: 1700, ecMaxUs: 2500 },
} as const;
export type CropPreset = keyof typeof CROP_PRESETS;

export const CROP_NAMES = Object.keys(CROP_PRESETS) as CropPreset[];

export const SOLUTION_TEMP_PRESET = { tempMin: 18, tempMax: 22 } as const;

/** The full band a new tank of this crop starts with. */
export function presetBand(crop: CropPreset) {
  return { ...CROP_PRESETS[crop], ...SOLUTION_TEMP_PRESET };
}
