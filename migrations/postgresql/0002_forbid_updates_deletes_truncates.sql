-- SPDX-License-Identifier: Apache-2.0
-- Facts are append-only: every fact table, the audit trail and the migration record refuse
-- UPDATE, DELETE and TRUNCATE (as SQLite's 0004, 0006 and 0007 refuse UPDATE and DELETE; SQLite
-- has no TRUNCATE). The role the tool runs as should also lack those privileges (README,
-- "Choosing a backend"): the triggers protect against the tool itself and against roles that
-- have them, the privileges against a role dropping the triggers. A change of state is a new row.

CREATE FUNCTION curvewarden_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% is append-only: rows cannot be %', TG_TABLE_NAME,
    CASE TG_OP WHEN 'UPDATE' THEN 'changed' WHEN 'DELETE' THEN 'deleted' ELSE 'truncated' END
    USING ERRCODE = 'integrity_constraint_violation';
END;
$$;

CREATE TRIGGER audit_log_no_update BEFORE UPDATE ON audit_log
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER audit_log_no_delete BEFORE DELETE ON audit_log
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER audit_log_no_truncate BEFORE TRUNCATE ON audit_log
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER schema_migrations_no_update BEFORE UPDATE ON schema_migrations
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER schema_migrations_no_delete BEFORE DELETE ON schema_migrations
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER schema_migrations_no_truncate BEFORE TRUNCATE ON schema_migrations
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER lab_settings_no_update BEFORE UPDATE ON lab_settings
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER lab_settings_no_delete BEFORE DELETE ON lab_settings
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER lab_settings_no_truncate BEFORE TRUNCATE ON lab_settings
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER instruments_no_update BEFORE UPDATE ON instruments
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER instruments_no_delete BEFORE DELETE ON instruments
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER instruments_no_truncate BEFORE TRUNCATE ON instruments
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER instrument_service_events_no_update BEFORE UPDATE ON instrument_service_events
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER instrument_service_events_no_delete BEFORE DELETE ON instrument_service_events
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER instrument_service_events_no_truncate BEFORE TRUNCATE ON instrument_service_events
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER methods_no_update BEFORE UPDATE ON methods
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER methods_no_delete BEFORE DELETE ON methods
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER methods_no_truncate BEFORE TRUNCATE ON methods
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER method_versions_no_update BEFORE UPDATE ON method_versions
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER method_versions_no_delete BEFORE DELETE ON method_versions
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER method_versions_no_truncate BEFORE TRUNCATE ON method_versions
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER lots_no_update BEFORE UPDATE ON lots
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER lots_no_delete BEFORE DELETE ON lots
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER lots_no_truncate BEFORE TRUNCATE ON lots
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER lot_values_no_update BEFORE UPDATE ON lot_values
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER lot_values_no_delete BEFORE DELETE ON lot_values
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER lot_values_no_truncate BEFORE TRUNCATE ON lot_values
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER lot_withdrawals_no_update BEFORE UPDATE ON lot_withdrawals
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER lot_withdrawals_no_delete BEFORE DELETE ON lot_withdrawals
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER lot_withdrawals_no_truncate BEFORE TRUNCATE ON lot_withdrawals
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER calibrations_no_update BEFORE UPDATE ON calibrations
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER calibrations_no_delete BEFORE DELETE ON calibrations
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER calibrations_no_truncate BEFORE TRUNCATE ON calibrations
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER calibration_lots_no_update BEFORE UPDATE ON calibration_lots
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER calibration_lots_no_delete BEFORE DELETE ON calibration_lots
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER calibration_lots_no_truncate BEFORE TRUNCATE ON calibration_lots
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER curves_no_update BEFORE UPDATE ON curves
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER curves_no_delete BEFORE DELETE ON curves
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER curves_no_truncate BEFORE TRUNCATE ON curves
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER curve_points_no_update BEFORE UPDATE ON curve_points
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER curve_points_no_delete BEFORE DELETE ON curve_points
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER curve_points_no_truncate BEFORE TRUNCATE ON curve_points
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER curve_reviews_no_update BEFORE UPDATE ON curve_reviews
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER curve_reviews_no_delete BEFORE DELETE ON curve_reviews
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER curve_reviews_no_truncate BEFORE TRUNCATE ON curve_reviews
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER curve_retirements_no_update BEFORE UPDATE ON curve_retirements
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER curve_retirements_no_delete BEFORE DELETE ON curve_retirements
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER curve_retirements_no_truncate BEFORE TRUNCATE ON curve_retirements
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER refusals_no_update BEFORE UPDATE ON refusals
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER refusals_no_delete BEFORE DELETE ON refusals
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER refusals_no_truncate BEFORE TRUNCATE ON refusals
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER checks_no_update BEFORE UPDATE ON checks
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER checks_no_delete BEFORE DELETE ON checks
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER checks_no_truncate BEFORE TRUNCATE ON checks
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER results_no_update BEFORE UPDATE ON results
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER results_no_delete BEFORE DELETE ON results
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER results_no_truncate BEFORE TRUNCATE ON results
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER instrument_column_maps_no_update BEFORE UPDATE ON instrument_column_maps
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER instrument_column_maps_no_delete BEFORE DELETE ON instrument_column_maps
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER instrument_column_maps_no_truncate BEFORE TRUNCATE ON instrument_column_maps
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER runs_no_update BEFORE UPDATE ON runs
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER runs_no_delete BEFORE DELETE ON runs
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER runs_no_truncate BEFORE TRUNCATE ON runs
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER run_results_no_update BEFORE UPDATE ON run_results
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER run_results_no_delete BEFORE DELETE ON run_results
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER run_results_no_truncate BEFORE TRUNCATE ON run_results
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER run_checks_no_update BEFORE UPDATE ON run_checks
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER run_checks_no_delete BEFORE DELETE ON run_checks
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER run_checks_no_truncate BEFORE TRUNCATE ON run_checks
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER result_status_events_no_update BEFORE UPDATE ON result_status_events
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER result_status_events_no_delete BEFORE DELETE ON result_status_events
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER result_status_events_no_truncate BEFORE TRUNCATE ON result_status_events
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER users_no_update BEFORE UPDATE ON users
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER users_no_delete BEFORE DELETE ON users
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER users_no_truncate BEFORE TRUNCATE ON users
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER user_events_no_update BEFORE UPDATE ON user_events
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER user_events_no_delete BEFORE DELETE ON user_events
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER user_events_no_truncate BEFORE TRUNCATE ON user_events
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER user_passphrases_no_update BEFORE UPDATE ON user_passphrases
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER user_passphrases_no_delete BEFORE DELETE ON user_passphrases
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER user_passphrases_no_truncate BEFORE TRUNCATE ON user_passphrases
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER signatures_no_update BEFORE UPDATE ON signatures
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER signatures_no_delete BEFORE DELETE ON signatures
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER signatures_no_truncate BEFORE TRUNCATE ON signatures
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

CREATE TRIGGER signature_failures_no_update BEFORE UPDATE ON signature_failures
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER signature_failures_no_delete BEFORE DELETE ON signature_failures
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER signature_failures_no_truncate BEFORE TRUNCATE ON signature_failures
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();
