import { type CreateTableBuilder, type Kysely, sql } from "kysely";

// Fields, plantings, the product catalog, fertilizer passes, weather, digs, photos, injury cases and
// the sync bookkeeping. Frozen: this file imports nothing from the app.

// Rows that devices create or edit carry a server version (the region's sync cursor at their last
// change), the version at which each field last changed (for field-by-field merges), who changed
// them and a tombstone.
function withSyncColumns<T extends string>(t: CreateTableBuilder<T, any>): CreateTableBuilder<T, any> {
  return t
    .addColumn("version", "bigint", (c) => c.notNull().defaultTo(0))
    .addColumn("field_versions", "jsonb", (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn("created_by", "uuid", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("updated_by", "uuid", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("deleted_at", "timestamptz");
}

const soil = sql`soil_texture in ('coarse','medium','fine')`;
const injury = (col: string) => sql.raw(`${col} in ('none','slight','moderate','severe')`);

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("sync_cursor")
    .addColumn("region_id", "uuid", (c) => c.primaryKey().references("region.id").onDelete("cascade"))
    .addColumn("version", "bigint", (c) => c.notNull().defaultTo(0))
    .execute();

  await db.schema
    .createTable("weather_station")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("region_id", "uuid", (c) => c.notNull().references("region.id"))
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("latitude", "double precision", (c) => c.notNull())
    .addColumn("longitude", "double precision", (c) => c.notNull())
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  await db.schema
    .createTable("weather_daily")
    .addColumn("station_id", "uuid", (c) => c.notNull().references("weather_station.id").onDelete("cascade"))
    .addColumn("day", "date", (c) => c.notNull())
    .addColumn("max_f", "double precision", (c) => c.notNull())
    .addColumn("min_f", "double precision", (c) => c.notNull())
    .addColumn("source", "text", (c) => c.notNull().defaultTo("upload"))
    .addColumn("version", "bigint", (c) => c.notNull().defaultTo(0))
    .addPrimaryKeyConstraint("weather_daily_pkey", ["station_id", "day"])
    .addCheckConstraint("weather_daily_min_max_check", sql`min_f <= max_f`)
    .execute();

  await withSyncColumns(
    db.schema
      .createTable("field")
      .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
      .addColumn("account_id", "uuid", (c) => c.notNull().references("account.id"))
      .addColumn("name", "text", (c) => c.notNull())
      .addColumn("boundary", "jsonb")
      .addColumn("area_acres", "double precision")
      .addColumn("centroid_lat", "double precision")
      .addColumn("centroid_lon", "double precision")
      .addColumn("irrigation", "text", (c) =>
        c.notNull().defaultTo("furrow").check(sql`irrigation in ('furrow','sprinkler','drip','none')`),
      )
      .addColumn("soil_texture", "text", (c) => c.notNull().defaultTo("medium").check(soil))
      .addColumn("weather_station_id", "uuid", (c) => c.references("weather_station.id"))
      .addColumn("first_irrigation_on", "date"),
  ).execute();
  await db.schema.createIndex("field_account_id_index").on("field").column("account_id").execute();

  await db.schema
    .createTable("product")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("name", "text", (c) => c.notNull().unique())
    .addColumn("chemistry", "text", (c) => c.notNull())
    .addColumn("form", "text", (c) => c.notNull().check(sql`form in ('liquid','dry','gas')`))
    .addColumn("grade_n", "double precision", (c) => c.notNull())
    .addColumn("grade_p2o5", "double precision", (c) => c.notNull())
    .addColumn("grade_k2o", "double precision", (c) => c.notNull())
    .addColumn("grade_s", "double precision", (c) => c.notNull().defaultTo(0))
    .addColumn("lb_per_gal", "double precision")
    .addColumn("density_source", "text")
    .addColumn("salt_index", "double precision")
    .addColumn("salt_index_source", "text")
    .addColumn("contains_urea", "boolean", (c) => c.notNull().defaultTo(false))
    .addColumn("contains_thiosulfate", "boolean", (c) => c.notNull().defaultTo(false))
    .addColumn("active", "boolean", (c) => c.notNull().defaultTo(true))
    .addColumn("version", "bigint", (c) => c.notNull().defaultTo(0))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint(
      "product_grade_check",
      sql`grade_n between 0 and 100 and grade_p2o5 between 0 and 100 and grade_k2o between 0 and 100 and grade_s between 0 and 100`,
    )
    .execute();

  await withSyncColumns(
    db.schema
      .createTable("planting")
      .addColumn("id", "uuid", (c) => c.primaryKey())
      .addColumn("field_id", "uuid", (c) => c.notNull().references("field.id"))
      .addColumn("account_id", "uuid", (c) => c.notNull().references("account.id"))
      .addColumn("hybrid", "text", (c) => c.notNull())
      .addColumn("planted_on", "date", (c) => c.notNull())
      .addColumn("seeding_rate", "double precision", (c) => c.notNull())
      .addColumn("seeding_depth_in", "double precision", (c) => c.notNull())
      .addColumn("row_spacing_in", "double precision", (c) => c.notNull())
      .addColumn("soil_texture", "text", (c) => c.notNull().check(soil))
      .addColumn("notes", "text"),
  ).execute();
  await db.schema.createIndex("planting_field_id_index").on("planting").column("field_id").execute();

  await withSyncColumns(
    db.schema
      .createTable("fertilizer_pass")
      .addColumn("id", "uuid", (c) => c.primaryKey())
      .addColumn("field_id", "uuid", (c) => c.notNull().references("field.id"))
      .addColumn("planting_id", "uuid", (c) => c.references("planting.id"))
      .addColumn("account_id", "uuid", (c) => c.notNull().references("account.id"))
      .addColumn("product_id", "uuid", (c) => c.notNull().references("product.id"))
      .addColumn("applied_on", "date", (c) => c.notNull())
      .addColumn("rate", "double precision", (c) => c.notNull().check(sql`rate >= 0`))
      .addColumn("rate_unit", "text", (c) => c.notNull().check(sql`rate_unit in ('lb/ac','gal/ac')`))
      .addColumn("placement", "text", (c) =>
        c.notNull().check(sql`placement in ('seed_placed','band_2x2','side_dress','broadcast')`),
      )
      .addColumn("intended_beside_in", "double precision")
      .addColumn("intended_below_in", "double precision")
      .addColumn("notes", "text"),
  ).execute();
  await db.schema
    .createIndex("fertilizer_pass_field_id_index")
    .on("fertilizer_pass")
    .column("field_id")
    .execute();

  await withSyncColumns(
    db.schema
      .createTable("dig_site")
      .addColumn("id", "uuid", (c) => c.primaryKey())
      .addColumn("field_id", "uuid", (c) => c.notNull().references("field.id"))
      .addColumn("planting_id", "uuid", (c) => c.references("planting.id"))
      .addColumn("account_id", "uuid", (c) => c.notNull().references("account.id"))
      .addColumn("rep_id", "uuid", (c) => c.references("app_user.id"))
      .addColumn("dug_at", "timestamptz", (c) => c.notNull())
      .addColumn("latitude", "double precision")
      .addColumn("longitude", "double precision")
      .addColumn("accuracy_m", "double precision")
      .addColumn("soil_moisture", "text", (c) =>
        c.check(sql`soil_moisture in ('dry','moist','wet','saturated')`),
      )
      .addColumn("soil_temp_f", "double precision")
      .addColumn("irrigated_yet", "boolean", (c) => c.notNull().defaultTo(false))
      .addColumn("recommendation", "text")
      .addColumn("flagged_by_rep", "boolean", (c) => c.notNull().defaultTo(false))
      .addColumn("notes", "text")
      // Computed by the server from the agronomy core on every merge; never taken from a device.
      .addColumn("root_index", "double precision")
      .addColumn("assessment", "jsonb"),
  ).execute();
  await db.schema.createIndex("dig_site_field_id_index").on("dig_site").column("field_id").execute();
  await db.schema.createIndex("dig_site_account_id_index").on("dig_site").column("account_id").execute();

  await withSyncColumns(
    db.schema
      .createTable("dug_plant")
      .addColumn("id", "uuid", (c) => c.primaryKey())
      .addColumn("dig_site_id", "uuid", (c) => c.notNull().references("dig_site.id"))
      .addColumn("position", "integer", (c) => c.notNull().defaultTo(1))
      .addColumn("leaf_stage", "text", (c) => c.notNull())
      .addColumn("seeding_depth_in", "double precision")
      .addColumn("crown_depth_in", "double precision")
      .addColumn("mesocotyl", "text", (c) =>
        c.check(sql`mesocotyl in ('healthy','discolored','damaged','severed')`),
      )
      .addColumn("seminal_score", "integer", (c) => c.check(sql`seminal_score between 0 and 5`))
      .addColumn("nodal_whorls", "integer", (c) => c.check(sql`nodal_whorls between 0 and 12`))
      .addColumn("nodal_count", "integer", (c) => c.check(sql`nodal_count between 0 and 80`))
      .addColumn("longest_nodal_in", "double precision")
      .addColumn("seminal_injury", "text", (c) =>
        c.notNull().defaultTo("none").check(injury("seminal_injury")),
      )
      .addColumn("nodal_injury", "text", (c) => c.notNull().defaultTo("none").check(injury("nodal_injury")))
      .addColumn("findings", sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'::text[]`))
      .addColumn("band_beside_in", "double precision")
      .addColumn("band_below_in", "double precision")
      .addColumn("notes", "text")
      .addColumn("root_index", "double precision"),
  ).execute();
  await db.schema.createIndex("dug_plant_dig_site_id_index").on("dug_plant").column("dig_site_id").execute();

  await withSyncColumns(
    db.schema
      .createTable("photo")
      .addColumn("id", "uuid", (c) => c.primaryKey())
      .addColumn("dig_site_id", "uuid", (c) => c.notNull().references("dig_site.id"))
      .addColumn("dug_plant_id", "uuid", (c) => c.references("dug_plant.id"))
      .addColumn("sha256", "text", (c) => c.notNull().check(sql`sha256 ~ '^[0-9a-f]{64}$'`))
      .addColumn("byte_size", "integer", (c) => c.notNull())
      .addColumn("content_type", "text", (c) => c.notNull())
      .addColumn("width", "integer")
      .addColumn("height", "integer")
      .addColumn("caption", "text")
      .addColumn("captured_at", "timestamptz")
      .addColumn("object_key", "text", (c) => c.notNull())
      .addColumn("confirmed_at", "timestamptz")
      .addColumn("is_illustration", "boolean", (c) => c.notNull().defaultTo(false)),
  ).execute();
  await db.schema.createIndex("photo_dig_site_id_index").on("photo").column("dig_site_id").execute();

  await withSyncColumns(
    db.schema
      .createTable("injury_case")
      .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
      .addColumn("dig_site_id", "uuid", (c) => c.notNull().unique().references("dig_site.id"))
      .addColumn("account_id", "uuid", (c) => c.notNull().references("account.id"))
      .addColumn("status", "text", (c) =>
        c.notNull().defaultTo("new").check(sql`status in ('new','in_review','decided','closed')`),
      )
      .addColumn("severity", "text", (c) =>
        c.notNull().check(sql`severity in ('caution','warning','critical')`),
      )
      .addColumn("decision", "text", (c) =>
        c.check(sql`decision in ('injury_confirmed','not_injury','inconclusive')`),
      )
      .addColumn("decision_reason", "text")
      .addColumn("assigned_to", "uuid", (c) => c.references("app_user.id"))
      .addColumn("shared_with_grower", "boolean", (c) => c.notNull().defaultTo(false))
      .addColumn("decided_at", "timestamptz"),
  ).execute();
  await db.schema.createIndex("injury_case_status_index").on("injury_case").column("status").execute();

  await db.schema
    .createTable("injury_case_event")
    .addColumn("id", "bigserial", (c) => c.primaryKey())
    .addColumn("case_id", "uuid", (c) => c.notNull().references("injury_case.id"))
    .addColumn("actor_id", "uuid", (c) => c.references("app_user.id"))
    .addColumn("kind", "text", (c) =>
      c.notNull().check(sql`kind in ('opened','status','assigned','comment','decision','shared','reopened')`),
    )
    .addColumn("body", "text")
    .addColumn("payload", "jsonb", (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex("injury_case_event_case_id_index")
    .on("injury_case_event")
    .column("case_id")
    .execute();
  // The audit trail is append-only for every role, including the application's own.
  await sql`
    create function injury_case_event_append_only() returns trigger language plpgsql as $$
    begin
      raise exception 'injury_case_event rows are append-only';
    end $$`.execute(db);
  await sql`
    create trigger injury_case_event_no_change before update or delete on injury_case_event
    for each row execute function injury_case_event_append_only()`.execute(db);
  await sql`
    create trigger injury_case_event_no_truncate before truncate on injury_case_event
    for each statement execute function injury_case_event_append_only()`.execute(db);

  // Sync bookkeeping (shared/SYNC.md).
  await db.schema
    .createTable("sync_client_group")
    .addColumn("id", "uuid", (c) => c.primaryKey())
    .addColumn("user_id", "uuid", (c) => c.notNull().references("app_user.id").onDelete("cascade"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createTable("sync_client")
    .addColumn("id", "uuid", (c) => c.primaryKey())
    .addColumn("client_group_id", "uuid", (c) =>
      c.notNull().references("sync_client_group.id").onDelete("cascade"),
    )
    .addColumn("last_mutation_id", "bigint", (c) => c.notNull().defaultTo(0))
    .addColumn("last_seen_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createTable("sync_mutation_result")
    .addColumn("client_id", "uuid", (c) => c.notNull().references("sync_client.id").onDelete("cascade"))
    .addColumn("mutation_id", "bigint", (c) => c.notNull())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("status", "text", (c) => c.notNull().check(sql`status in ('applied','rejected')`))
    .addColumn("reason", "text")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addPrimaryKeyConstraint("sync_mutation_result_pkey", ["client_id", "mutation_id"])
    .execute();
  await db.schema
    .createTable("sync_conflict")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("region_id", "uuid", (c) => c.notNull().references("region.id"))
    .addColumn("table_name", "text", (c) => c.notNull())
    .addColumn("record_id", "uuid", (c) => c.notNull())
    .addColumn("field_name", "text", (c) => c.notNull())
    .addColumn("base_version", "bigint", (c) => c.notNull())
    .addColumn("server_value", "jsonb")
    .addColumn("client_value", "jsonb")
    .addColumn("server_user_id", "uuid", (c) => c.references("app_user.id"))
    .addColumn("client_user_id", "uuid", (c) => c.references("app_user.id"))
    .addColumn("server_changed_at", "timestamptz")
    .addColumn("client_received_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("client_observed_at", "timestamptz")
    .addColumn("settled_by", "uuid", (c) => c.references("app_user.id"))
    .addColumn("settled_at", "timestamptz")
    .addColumn("settled_value", "jsonb")
    .addColumn("version", "bigint", (c) => c.notNull().defaultTo(0))
    .execute();
  await db.schema
    .createIndex("sync_conflict_record_id_index")
    .on("sync_conflict")
    .column("record_id")
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of [
    "sync_conflict",
    "sync_mutation_result",
    "sync_client",
    "sync_client_group",
    "injury_case_event",
    "injury_case",
    "photo",
    "dug_plant",
    "dig_site",
    "fertilizer_pass",
    "planting",
    "product",
    "field",
    "weather_daily",
    "weather_station",
    "sync_cursor",
  ]) {
    await db.schema.dropTable(table).execute();
  }
  await sql`drop function if exists injury_case_event_append_only()`.execute(db);
}
