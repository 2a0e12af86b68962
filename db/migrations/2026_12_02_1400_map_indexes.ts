import type { Kysely } from "kysely";

// The field map asks for the dig pins and field shapes within a view's bounds, often narrowed by dig
// date: a latitude-first index answers the bounds (a view is narrower in latitude than in longitude
// at field zooms), one on dug_at the date range, one on the field centroid the field layer. Frozen:
// this file imports nothing from the app.

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createIndex("dig_site_latitude_longitude_index")
    .on("dig_site")
    .columns(["latitude", "longitude"])
    .execute();
  await db.schema.createIndex("dig_site_dug_at_index").on("dig_site").column("dug_at").execute();
  await db.schema
    .createIndex("field_centroid_lat_centroid_lon_index")
    .on("field")
    .columns(["centroid_lat", "centroid_lon"])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex("field_centroid_lat_centroid_lon_index").execute();
  await db.schema.dropIndex("dig_site_dug_at_index").execute();
  await db.schema.dropIndex("dig_site_latitude_longitude_index").execute();
}
