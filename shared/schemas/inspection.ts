import { z } from 'zod';

/** How an inspected part looked: fine, fine with a remark, or a finding the client should read. */
export const INSPECTION_RATINGS = ['good', 'acceptable', 'concern'] as const;
export const InspectionRatingSchema = z.enum(INSPECTION_RATINGS);
export type InspectionRating = z.infer<typeof InspectionRatingSchema>;

const title = z.string().trim().min(1).max(200);

/** One line of the lab's teardown checklist (admins edit the list). */
export const InspectionItemSchema = z.object({
  id: z.number().int(),
  title: z.string(),
  position: z.number().int(),
  /** Retired items keep their old ratings and photos but are not offered for new inspections. */
  archived: z.boolean(),
});
export type InspectionItem = z.infer<typeof InspectionItemSchema>;

/** POST /api/inspection-items (admin): add an item at the end, or at `position`. */
export const InspectionItemInputSchema = z.object({ title, position: z.number().int().min(1).max(1000).optional() });

/** PATCH /api/inspection-items/:id (admin): rename, move or retire an item. */
export const InspectionItemPatchSchema = z
  .object({ title: title.optional(), position: z.number().int().min(1).max(1000).optional(), archived: z.boolean().optional() })
  .strict()
  .refine((p) => Object.keys(p).length > 0, { message: 'Nothing to change' });

/** PUT /api/batteries/:id/inspection/:itemId (technician): rate one item; null clears it. */
export const InspectionEntryInputSchema = z.object({
  rating: InspectionRatingSchema.nullable(),
  note: z.string().trim().max(4000).nullable().default(null),
});
export type InspectionEntryInput = z.input<typeof InspectionEntryInputSchema>;

/** URLs of the stored copies of a photo (every copy stripped of its metadata). */
export const PhotoUrlsSchema = z.object({ thumb: z.string(), web: z.string(), full: z.string() });

/** A teardown photo as the API returns it. */
export const PhotoSchema = z.object({
  id: z.number().int(),
  batteryId: z.number().int(),
  itemId: z.number().int().nullable(),
  fileName: z.string(),
  widthPx: z.number().int(),
  heightPx: z.number().int(),
  bytes: z.number().int(),
  createdBy: z.number().int().nullable(),
  createdAt: z.string(),
  urls: PhotoUrlsSchema,
});
export type Photo = z.infer<typeof PhotoSchema>;

/** One checklist item as rated for one pack, with its photos. */
export const InspectionEntrySchema = z.object({
  item: InspectionItemSchema,
  rating: InspectionRatingSchema.nullable(),
  note: z.string().nullable(),
  updatedAt: z.string().nullable(),
  photos: z.array(PhotoSchema),
});
export type InspectionEntry = z.infer<typeof InspectionEntrySchema>;

/** GET /api/batteries/:id/inspection: every active item (and any retired one already rated), plus photos of no item. */
export const InspectionResponseSchema = z.object({
  entries: z.array(InspectionEntrySchema),
  /** Photos attached to the pack but to no checklist item. */
  otherPhotos: z.array(PhotoSchema),
});
export type InspectionResponse = z.infer<typeof InspectionResponseSchema>;

/** Multipart fields of POST /api/batteries/:id/photos besides `file`. */
export const PhotoUploadFieldsSchema = z.object({ item: z.coerce.number().int().positive().optional() });
