import { MigrationInterface, QueryRunner } from "typeorm";

export class Initial1796164898955 implements MigrationInterface {
    name = 'Initial1796164898955'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "farms" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "slug" text NOT NULL, "name" text NOT NULL, "time_zone" text NOT NULL, "longitude" double precision, "latitude" double precision, "display_prefs" jsonb NOT NULL DEFAULT '{}'::jsonb, "settings" jsonb NOT NULL DEFAULT '{}'::jsonb, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_39aff9c35006b14025bba5a43d9" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_farms_slug" ON "farms"  ("slug") `);
        await queryRunner.query(`CREATE TABLE "users" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "email" text NOT NULL, "name" text NOT NULL, "password_hash" text, "is_admin" boolean NOT NULL DEFAULT false, "locale" text NOT NULL DEFAULT 'en', "prefs" jsonb NOT NULL DEFAULT '{}'::jsonb, "active" boolean NOT NULL DEFAULT true, "token_version" integer NOT NULL DEFAULT '0', "last_login_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_a3ffb1c0c8416b9fc6f907b7433" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_users_email" ON "users"  ("email") `);
        await queryRunner.query(`CREATE TABLE "memberships" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "user_id" uuid NOT NULL, "role" text NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_25d28bd932097a9e90495ede7b4" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_memberships_user" ON "memberships"  ("user_id") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_memberships_farm_user" ON "memberships"  ("farm_id", "user_id") `);
        await queryRunner.query(`CREATE TABLE "password_reset_tokens" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "user_id" uuid NOT NULL, "token_hash" text NOT NULL, "purpose" text NOT NULL DEFAULT 'reset', "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "used_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_d16bebd73e844c48bca50ff8d3d" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_password_reset_tokens_user" ON "password_reset_tokens"  ("user_id") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_password_reset_tokens_hash" ON "password_reset_tokens"  ("token_hash") `);
        await queryRunner.query(`CREATE TABLE "culture_units" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "code" text NOT NULL, "name" text NOT NULL, "kind" text NOT NULL, "outline" jsonb, "area_m2" double precision, "volume_m3" double precision, "water_type" text NOT NULL DEFAULT 'fresh', "default_salinity_ppt" double precision NOT NULL DEFAULT '0', "species" text, "life_stage" text, "state" text NOT NULL DEFAULT 'active', "test_frequency_days" integer, "qr_label_id" text NOT NULL, "walk_order" integer NOT NULL DEFAULT '0', "threshold_profile_id" uuid, "feed_protein_fraction" double precision NOT NULL DEFAULT '0.32', "close_watch_until" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_fafba1cf475ccfeb9d47e86c7ca" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_culture_units_qr_label" ON "culture_units"  ("qr_label_id") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_culture_units_farm_code" ON "culture_units"  ("farm_id", "code") `);
        await queryRunner.query(`CREATE TABLE "flow_measurements" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "unit_id" uuid NOT NULL, "measured_at" TIMESTAMP WITH TIME ZONE NOT NULL, "flow_lpm" double precision NOT NULL, "source" text NOT NULL DEFAULT 'manual', "note" text, "recorded_by_id" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_e845eb3d059b0a111c7a34bcb1b" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_flow_measurements_unit_at" ON "flow_measurements"  ("unit_id", "measured_at") `);
        await queryRunner.query(`CREATE TABLE "probes" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "unit_id" uuid, "probe_key" text NOT NULL, "label" text NOT NULL, "model" text, "quantities" jsonb NOT NULL DEFAULT '[]'::jsonb, "interval_seconds" integer NOT NULL DEFAULT '60', "secret_hash" text NOT NULL, "secret_rotated_at" TIMESTAMP WITH TIME ZONE NOT NULL, "active" boolean NOT NULL DEFAULT true, "last_seen_at" TIMESTAMP WITH TIME ZONE, "battery_pct" double precision, "rssi_dbm" double precision, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_7c839c90f8cb3aff3f99b122d0f" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_probes_probe_key" ON "probes"  ("probe_key") `);
        await queryRunner.query(`CREATE INDEX "ix_probes_unit" ON "probes"  ("unit_id") `);
        await queryRunner.query(`CREATE TABLE "probe_calibrations" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "probe_id" uuid NOT NULL, "quantity" text NOT NULL, "performed_at" TIMESTAMP WITH TIME ZONE NOT NULL, "performed_by_id" uuid, "method" text NOT NULL, "details" jsonb NOT NULL DEFAULT '{}'::jsonb, "passed" boolean NOT NULL, "next_due_at" TIMESTAMP WITH TIME ZONE NOT NULL, "note" text, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_18cdd1969cfc54a5f9cbfa4bd07" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_probe_calibrations_probe_at" ON "probe_calibrations"  ("probe_id", "performed_at") `);
        await queryRunner.query(`CREATE TABLE "probe_maintenance_windows" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "probe_id" uuid NOT NULL, "starts_at" TIMESTAMP WITH TIME ZONE NOT NULL, "ends_at" TIMESTAMP WITH TIME ZONE NOT NULL, "reason" text NOT NULL, "created_by_id" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_70a81a2deeb389ba90af2ed09f4" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_probe_maintenance_windows_probe" ON "probe_maintenance_windows"  ("probe_id", "starts_at") `);
        await queryRunner.query(`CREATE TABLE "readings" ("probe_id" uuid NOT NULL, "quantity" text NOT NULL, "at" TIMESTAMP WITH TIME ZONE NOT NULL, "value" double precision NOT NULL, "quality" text NOT NULL DEFAULT 'good', "received_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "pk_readings" PRIMARY KEY ("probe_id", "quantity", "at"))`);
        await queryRunner.query(`CREATE TABLE "probe_rejects" ("probe_key" text NOT NULL, "reason" text NOT NULL, "count" bigint NOT NULL DEFAULT '0', "last_at" TIMESTAMP WITH TIME ZONE NOT NULL, "last_detail" text, CONSTRAINT "pk_probe_rejects" PRIMARY KEY ("probe_key", "reason"))`);
        await queryRunner.query(`CREATE TABLE "water_tests" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "unit_id" uuid NOT NULL, "client_id" uuid NOT NULL, "analyte" text NOT NULL, "method" text NOT NULL, "basis" text NOT NULL, "value" double precision NOT NULL, "unit" text NOT NULL, "sampled_at" TIMESTAMP WITH TIME ZONE NOT NULL, "handheld_ph" double precision, "handheld_temperature_c" double precision, "handheld_salinity_ppt" double precision, "note" text, "photo_path" text, "source" text NOT NULL DEFAULT 'pondside', "aerator_on" boolean, "entered_by_id" uuid, "version" integer NOT NULL DEFAULT '1', "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_d646cd7226efebd29bf6b805cb4" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_water_tests_unit_sampled" ON "water_tests"  ("unit_id", "sampled_at") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_water_tests_farm_client" ON "water_tests"  ("farm_id", "client_id") `);
        await queryRunner.query(`CREATE TABLE "free_ammonia_results" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "water_test_id" uuid NOT NULL, "farm_id" uuid NOT NULL, "unit_id" uuid NOT NULL, "sampled_at" TIMESTAMP WITH TIME ZONE NOT NULL, "status" text NOT NULL, "tan_mg_l" double precision, "nh3_n_mg_l" double precision, "nh3_mg_l" double precision, "fraction" double precision, "p_ka" double precision, "method" text, "ph_scale" text, "ph" double precision, "temperature_c" double precision, "salinity_ppt" double precision, "provenance" jsonb NOT NULL, "flags" jsonb NOT NULL DEFAULT '[]'::jsonb, "forecast_peak" jsonb, "test_version" integer NOT NULL, "computed_at" TIMESTAMP WITH TIME ZONE NOT NULL, CONSTRAINT "PK_c22f4fa1d6ae9f3ffd429925167" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_free_ammonia_results_test" ON "free_ammonia_results"  ("water_test_id") `);
        await queryRunner.query(`CREATE INDEX "ix_free_ammonia_results_unit_sampled" ON "free_ammonia_results"  ("unit_id", "sampled_at") `);
        await queryRunner.query(`CREATE TABLE "treatments" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "unit_id" uuid NOT NULL, "product" text NOT NULL, "product_name" text, "dose" double precision, "dose_unit" text, "starts_at" TIMESTAMP WITH TIME ZONE NOT NULL, "ends_at" TIMESTAMP WITH TIME ZONE, "withdrawal_days" double precision, "withdrawal_degree_days" double precision, "withdrawal_ends_at" TIMESTAMP WITH TIME ZONE, "note" text, "created_by_id" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_133f26d52c70b9fa3c2dbb3c89e" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_treatments_unit_starts" ON "treatments"  ("unit_id", "starts_at") `);
        await queryRunner.query(`CREATE TABLE "observations" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "unit_id" uuid NOT NULL, "client_id" uuid, "kind" text NOT NULL, "detail" text, "count" integer, "photo_path" text, "observed_at" TIMESTAMP WITH TIME ZONE NOT NULL, "created_by_id" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_f9208d64f50a76030758087c0ef" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_observations_unit_at" ON "observations"  ("unit_id", "observed_at") `);
        await queryRunner.query(`CREATE TABLE "threshold_profiles" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "name" text NOT NULL, "species" text NOT NULL, "life_stage" text, "rules" jsonb NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_49b0b0f81bd60fc19d589808da9" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_threshold_profiles_farm" ON "threshold_profiles"  ("farm_id") `);
        await queryRunner.query(`CREATE TABLE "alerts" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "unit_id" uuid, "probe_id" uuid, "kind" text NOT NULL, "level" text NOT NULL, "state" text NOT NULL DEFAULT 'open', "condition_key" text NOT NULL, "title" text NOT NULL, "message" text NOT NULL, "values" jsonb NOT NULL DEFAULT '{}'::jsonb, "rule" jsonb NOT NULL DEFAULT '{}'::jsonb, "opened_at" TIMESTAMP WITH TIME ZONE NOT NULL, "last_seen_at" TIMESTAMP WITH TIME ZONE NOT NULL, "clear_since" TIMESTAMP WITH TIME ZONE, "acknowledged_at" TIMESTAMP WITH TIME ZONE, "acknowledged_by_id" uuid, "assigned_to_id" uuid, "resolved_at" TIMESTAMP WITH TIME ZONE, "resolved_by_id" uuid, "resolution_note" text, "escalation_step" integer NOT NULL DEFAULT '0', "next_escalation_at" TIMESTAMP WITH TIME ZONE, "realert_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_60f895662df096bfcdfab7f4b96" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_alerts_open_condition" ON "alerts"  ("farm_id", "condition_key") WHERE "state" <> 'resolved'`);
        await queryRunner.query(`CREATE INDEX "ix_alerts_farm_state" ON "alerts"  ("farm_id", "state") `);
        await queryRunner.query(`CREATE TABLE "alert_events" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "alert_id" uuid NOT NULL, "at" TIMESTAMP WITH TIME ZONE NOT NULL, "type" text NOT NULL, "user_id" uuid, "details" jsonb NOT NULL DEFAULT '{}'::jsonb, CONSTRAINT "PK_f8dd833a0534d3a01e8d01e3bca" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_alert_events_alert_at" ON "alert_events"  ("alert_id", "at") `);
        await queryRunner.query(`CREATE TABLE "on_call_entries" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "user_id" uuid NOT NULL, "position" integer NOT NULL, "starts_local" text NOT NULL DEFAULT '00:00', "ends_local" text NOT NULL DEFAULT '24:00', "weekdays" jsonb NOT NULL DEFAULT '[1,2,3,4,5,6,7]'::jsonb, CONSTRAINT "PK_90eddca4f565e98c28d08fe5c2c" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_on_call_entries_farm_position" ON "on_call_entries"  ("farm_id", "position") `);
        await queryRunner.query(`CREATE TABLE "stock_events" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "unit_id" uuid NOT NULL, "kind" text NOT NULL, "at" TIMESTAMP WITH TIME ZONE NOT NULL, "count" integer, "total_weight_kg" double precision, "mean_weight_g" double precision, "sample_size" integer, "sample_sd_g" double precision, "mean_length_cm" double precision, "related_unit_id" uuid, "note" text, "created_by_id" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_db7db124ebb08396e7448c73d45" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_stock_events_unit_at" ON "stock_events"  ("unit_id", "at") `);
        await queryRunner.query(`CREATE TABLE "feeding_tables" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "species" text NOT NULL, "name" text NOT NULL, "rows" jsonb NOT NULL, "source" text NOT NULL, "max_kg_per_ha_per_day" double precision, CONSTRAINT "PK_d6fef4ff97f324ac746bde06057" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_feeding_tables_farm_species" ON "feeding_tables"  ("farm_id", "species") `);
        await queryRunner.query(`CREATE TABLE "feed_recommendations" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "unit_id" uuid NOT NULL, "day" date NOT NULL, "biomass_kg" double precision NOT NULL, "planned_kg" double precision NOT NULL, "planned_pct_bw" double precision NOT NULL, "action" text NOT NULL, "cut_pct" double precision NOT NULL DEFAULT '0', "recommended_kg" double precision NOT NULL, "reasons" jsonb NOT NULL, "inputs" jsonb NOT NULL, "rule_version" text NOT NULL, "status" text NOT NULL DEFAULT 'pending', "approved_kg" double precision, "override_note" text, "decided_by_id" uuid, "decided_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "computed_at" TIMESTAMP WITH TIME ZONE NOT NULL, CONSTRAINT "PK_ea161ab48346e3eb902570b9dca" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_feed_recommendations_farm_day" ON "feed_recommendations"  ("farm_id", "day") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_feed_recommendations_unit_day" ON "feed_recommendations"  ("unit_id", "day") `);
        await queryRunner.query(`CREATE TABLE "feeding_records" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "unit_id" uuid NOT NULL, "day" date NOT NULL, "fed_kg" double precision NOT NULL, "withheld" boolean NOT NULL DEFAULT false, "reason" text, "response" text, "fed_at" TIMESTAMP WITH TIME ZONE NOT NULL, "recorded_by_id" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_7e9258bc22a3cae38ab6d3c1088" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_feeding_records_unit_day" ON "feeding_records"  ("unit_id", "day") `);
        await queryRunner.query(`CREATE TABLE "audit_events" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid, "actor_id" uuid, "at" TIMESTAMP WITH TIME ZONE NOT NULL, "action" text NOT NULL, "entity" text NOT NULL, "entity_id" text, "before" jsonb, "after" jsonb, CONSTRAINT "PK_910f64d901a5c3e9878f0d4a407" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_audit_events_farm_at" ON "audit_events"  ("farm_id", "at") `);
        await queryRunner.query(`CREATE TABLE "outbox_messages" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid, "kind" text NOT NULL, "to_address" text NOT NULL, "subject" text NOT NULL, "body" text NOT NULL, "status" text NOT NULL DEFAULT 'queued', "provider_message_id" text, "error" text, "related_id" text, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "sent_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_0171348f527c64b137e4d4f5b66" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_outbox_messages_farm_created" ON "outbox_messages"  ("farm_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "morning_reports" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "day" date NOT NULL, "content" jsonb NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL, CONSTRAINT "PK_91e4f4dca97ebd2b1d8e01b9c75" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "ux_morning_reports_farm_day" ON "morning_reports"  ("farm_id", "day") `);
        await queryRunner.query(`CREATE TABLE "aerial_photos" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "farm_id" uuid NOT NULL, "file_name" text NOT NULL, "content_type" text NOT NULL, "corners" jsonb NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_b61e3d8b693eb7ea25778b6a10c" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "ix_aerial_photos_farm" ON "aerial_photos"  ("farm_id") `);
        await queryRunner.query(`ALTER TABLE "memberships" ADD CONSTRAINT "FK_f44b21812727366735f17933cf2" FOREIGN KEY ("farm_id") REFERENCES "farms"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "memberships" ADD CONSTRAINT "FK_7c1e2fdfed4f6838e0c05ae5051" FOREIGN KEY ("user_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        // Hand-written additions: BRIN on reading time (cheap farm-wide time scans, tiny write cost),
        // and foreign keys so no row can point at a farm, unit or probe that is gone. Readings carry no
        // foreign key on purpose: ingest is the hot path and only writes probe ids it has just authenticated.
        await queryRunner.query(`CREATE INDEX "brin_readings_at" ON "readings" USING brin ("at") WITH (pages_per_range = 32)`);
        const fks: Array<[string, string, string]> = [
            ['culture_units', 'farm_id', 'farms'], ['probes', 'farm_id', 'farms'], ['probes', 'unit_id', 'culture_units'],
            ['flow_measurements', 'unit_id', 'culture_units'], ['probe_calibrations', 'probe_id', 'probes'],
            ['probe_maintenance_windows', 'probe_id', 'probes'], ['water_tests', 'unit_id', 'culture_units'],
            ['free_ammonia_results', 'water_test_id', 'water_tests'], ['treatments', 'unit_id', 'culture_units'],
            ['observations', 'unit_id', 'culture_units'], ['threshold_profiles', 'farm_id', 'farms'],
            ['alerts', 'farm_id', 'farms'], ['alert_events', 'alert_id', 'alerts'], ['on_call_entries', 'farm_id', 'farms'],
            ['on_call_entries', 'user_id', 'users'], ['stock_events', 'unit_id', 'culture_units'],
            ['feeding_tables', 'farm_id', 'farms'], ['feed_recommendations', 'unit_id', 'culture_units'],
            ['feeding_records', 'unit_id', 'culture_units'], ['password_reset_tokens', 'user_id', 'users'],
            ['morning_reports', 'farm_id', 'farms'], ['aerial_photos', 'farm_id', 'farms'],
        ];
        for (const [table, column, target] of fks) {
            const setNull = table === 'probes' && column === 'unit_id';
            await queryRunner.query(`ALTER TABLE "${table}" ADD CONSTRAINT "fk_${table}_${column}" FOREIGN KEY ("${column}") REFERENCES "${target}"("id") ON DELETE ${setNull ? 'SET NULL' : 'CASCADE'}`);
        }
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "memberships" DROP CONSTRAINT "FK_7c1e2fdfed4f6838e0c05ae5051"`);
        await queryRunner.query(`ALTER TABLE "memberships" DROP CONSTRAINT "FK_f44b21812727366735f17933cf2"`);
        await queryRunner.query(`DROP INDEX "public"."ix_aerial_photos_farm"`);
        await queryRunner.query(`DROP TABLE "aerial_photos"`);
        await queryRunner.query(`DROP INDEX "public"."ux_morning_reports_farm_day"`);
        await queryRunner.query(`DROP TABLE "morning_reports"`);
        await queryRunner.query(`DROP INDEX "public"."ix_outbox_messages_farm_created"`);
        await queryRunner.query(`DROP TABLE "outbox_messages"`);
        await queryRunner.query(`DROP INDEX "public"."ix_audit_events_farm_at"`);
        await queryRunner.query(`DROP TABLE "audit_events"`);
        await queryRunner.query(`DROP INDEX "public"."ix_feeding_records_unit_day"`);
        await queryRunner.query(`DROP TABLE "feeding_records"`);
        await queryRunner.query(`DROP INDEX "public"."ux_feed_recommendations_unit_day"`);
        await queryRunner.query(`DROP INDEX "public"."ix_feed_recommendations_farm_day"`);
        await queryRunner.query(`DROP TABLE "feed_recommendations"`);
        await queryRunner.query(`DROP INDEX "public"."ix_feeding_tables_farm_species"`);
        await queryRunner.query(`DROP TABLE "feeding_tables"`);
        await queryRunner.query(`DROP INDEX "public"."ix_stock_events_unit_at"`);
        await queryRunner.query(`DROP TABLE "stock_events"`);
        await queryRunner.query(`DROP INDEX "public"."ix_on_call_entries_farm_position"`);
        await queryRunner.query(`DROP TABLE "on_call_entries"`);
        await queryRunner.query(`DROP INDEX "public"."ix_alert_events_alert_at"`);
        await queryRunner.query(`DROP TABLE "alert_events"`);
        await queryRunner.query(`DROP INDEX "public"."ix_alerts_farm_state"`);
        await queryRunner.query(`DROP INDEX "public"."ux_alerts_open_condition"`);
        await queryRunner.query(`DROP TABLE "alerts"`);
        await queryRunner.query(`DROP INDEX "public"."ix_threshold_profiles_farm"`);
        await queryRunner.query(`DROP TABLE "threshold_profiles"`);
        await queryRunner.query(`DROP INDEX "public"."ix_observations_unit_at"`);
        await queryRunner.query(`DROP TABLE "observations"`);
        await queryRunner.query(`DROP INDEX "public"."ix_treatments_unit_starts"`);
        await queryRunner.query(`DROP TABLE "treatments"`);
        await queryRunner.query(`DROP INDEX "public"."ix_free_ammonia_results_unit_sampled"`);
        await queryRunner.query(`DROP INDEX "public"."ux_free_ammonia_results_test"`);
        await queryRunner.query(`DROP TABLE "free_ammonia_results"`);
        await queryRunner.query(`DROP INDEX "public"."ux_water_tests_farm_client"`);
        await queryRunner.query(`DROP INDEX "public"."ix_water_tests_unit_sampled"`);
        await queryRunner.query(`DROP TABLE "water_tests"`);
        await queryRunner.query(`DROP TABLE "probe_rejects"`);
        await queryRunner.query(`DROP TABLE "readings"`);
        await queryRunner.query(`DROP INDEX "public"."ix_probe_maintenance_windows_probe"`);
        await queryRunner.query(`DROP TABLE "probe_maintenance_windows"`);
        await queryRunner.query(`DROP INDEX "public"."ix_probe_calibrations_probe_at"`);
        await queryRunner.query(`DROP TABLE "probe_calibrations"`);
        await queryRunner.query(`DROP INDEX "public"."ix_probes_unit"`);
        await queryRunner.query(`DROP INDEX "public"."ux_probes_probe_key"`);
        await queryRunner.query(`DROP TABLE "probes"`);
        await queryRunner.query(`DROP INDEX "public"."ix_flow_measurements_unit_at"`);
        await queryRunner.query(`DROP TABLE "flow_measurements"`);
        await queryRunner.query(`DROP INDEX "public"."ux_culture_units_farm_code"`);
        await queryRunner.query(`DROP INDEX "public"."ux_culture_units_qr_label"`);
        await queryRunner.query(`DROP TABLE "culture_units"`);
        await queryRunner.query(`DROP INDEX "public"."ux_password_reset_tokens_hash"`);
        await queryRunner.query(`DROP INDEX "public"."ix_password_reset_tokens_user"`);
        await queryRunner.query(`DROP TABLE "password_reset_tokens"`);
        await queryRunner.query(`DROP INDEX "public"."ux_memberships_farm_user"`);
        await queryRunner.query(`DROP INDEX "public"."ix_memberships_user"`);
        await queryRunner.query(`DROP TABLE "memberships"`);
        await queryRunner.query(`DROP INDEX "public"."ux_users_email"`);
        await queryRunner.query(`DROP TABLE "users"`);
        await queryRunner.query(`DROP INDEX "public"."ux_farms_slug"`);
        await queryRunner.query(`DROP TABLE "farms"`);
    }

}
