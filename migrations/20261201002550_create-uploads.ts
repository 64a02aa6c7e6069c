import type { Knex } from "knex";

/** Photos and PDFs in object storage, attached to an engine or a reading set. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("uploads", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.bigInteger("engine_id").unsigned().nullable().references("id").inTable("engines").onDelete("CASCADE");
    t.bigInteger("reading_set_id").unsigned().nullable().references("id").inTable("reading_sets").onDelete("CASCADE");
    t.tinyint("cylinder_no").unsigned().nullable();
    t.string("object_key", 255).notNullable().unique();
    t.string("thumbnail_key", 255).nullable();
    t.string("content_type", 60).notNullable();
    t.integer("byte_size").unsigned().notNullable();
    t.string("original_name", 160).notNullable();
    t.string("caption", 200).nullable();
    t.string("uploaded_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.datetime("archived_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.index(["engine_id", "created_at"]);
    t.index(["reading_set_id"]);
    t.index(["organisation_id", "created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("uploads");
}
