-- SPDX-License-Identifier: Apache-2.0
-- Facts are append-only: every table refuses UPDATE and DELETE. A change of state is a new
-- row; the audit trail and the migration record are protected the same way.

CREATE TRIGGER audit_log_no_update BEFORE UPDATE ON audit_log
BEGIN SELECT RAISE(ABORT, 'audit_log is append-only: rows cannot be changed'); END;
CREATE TRIGGER audit_log_no_delete BEFORE DELETE ON audit_log
BEGIN SELECT RAISE(ABORT, 'audit_log is append-only: rows cannot be deleted'); END;

CREATE TRIGGER lab_settings_no_update BEFORE UPDATE ON lab_settings
BEGIN SELECT RAISE(ABORT, 'lab_settings is append-only: rows cannot be changed'); END;
CREATE TRIGGER lab_settings_no_delete BEFORE DELETE ON lab_settings
BEGIN SELECT RAISE(ABORT, 'lab_settings is append-only: rows cannot be deleted'); END;

CREATE TRIGGER instruments_no_update BEFORE UPDATE ON instruments
BEGIN SELECT RAISE(ABORT, 'instruments is append-only: rows cannot be changed'); END;
CREATE TRIGGER instruments_no_delete BEFORE DELETE ON instruments
BEGIN SELECT RAISE(ABORT, 'instruments is append-only: rows cannot be deleted'); END;

CREATE TRIGGER instrument_service_events_no_update BEFORE UPDATE ON instrument_service_events
BEGIN SELECT RAISE(ABORT, 'instrument_service_events is append-only: rows cannot be changed'); END;
CREATE TRIGGER instrument_service_events_no_delete BEFORE DELETE ON instrument_service_events
BEGIN SELECT RAISE(ABORT, 'instrument_service_events is append-only: rows cannot be deleted'); END;

CREATE TRIGGER methods_no_update BEFORE UPDATE ON methods
BEGIN SELECT RAISE(ABORT, 'methods is append-only: rows cannot be changed'); END;
CREATE TRIGGER methods_no_delete BEFORE DELETE ON methods
BEGIN SELECT RAISE(ABORT, 'methods is append-only: rows cannot be deleted'); END;

CREATE TRIGGER method_versions_no_update BEFORE UPDATE ON method_versions
BEGIN SELECT RAISE(ABORT, 'method_versions is append-only: rows cannot be changed'); END;
CREATE TRIGGER method_versions_no_delete BEFORE DELETE ON method_versions
BEGIN SELECT RAISE(ABORT, 'method_versions is append-only: rows cannot be deleted'); END;

CREATE TRIGGER lots_no_update BEFORE UPDATE ON lots
BEGIN SELECT RAISE(ABORT, 'lots is append-only: rows cannot be changed'); END;
CREATE TRIGGER lots_no_delete BEFORE DELETE ON lots
BEGIN SELECT RAISE(ABORT, 'lots is append-only: rows cannot be deleted'); END;

CREATE TRIGGER lot_values_no_update BEFORE UPDATE ON lot_values
BEGIN SELECT RAISE(ABORT, 'lot_values is append-only: rows cannot be changed'); END;
CREATE TRIGGER lot_values_no_delete BEFORE DELETE ON lot_values
BEGIN SELECT RAISE(ABORT, 'lot_values is append-only: rows cannot be deleted'); END;

CREATE TRIGGER lot_withdrawals_no_update BEFORE UPDATE ON lot_withdrawals
BEGIN SELECT RAISE(ABORT, 'lot_withdrawals is append-only: rows cannot be changed'); END;
CREATE TRIGGER lot_withdrawals_no_delete BEFORE DELETE ON lot_withdrawals
BEGIN SELECT RAISE(ABORT, 'lot_withdrawals is append-only: rows cannot be deleted'); END;

CREATE TRIGGER calibrations_no_update BEFORE UPDATE ON calibrations
BEGIN SELECT RAISE(ABORT, 'calibrations is append-only: rows cannot be changed'); END;
CREATE TRIGGER calibrations_no_delete BEFORE DELETE ON calibrations
BEGIN SELECT RAISE(ABORT, 'calibrations is append-only: rows cannot be deleted'); END;

CREATE TRIGGER calibration_lots_no_update BEFORE UPDATE ON calibration_lots
BEGIN SELECT RAISE(ABORT, 'calibration_lots is append-only: rows cannot be changed'); END;
CREATE TRIGGER calibration_lots_no_delete BEFORE DELETE ON calibration_lots
BEGIN SELECT RAISE(ABORT, 'calibration_lots is append-only: rows cannot be deleted'); END;

CREATE TRIGGER curves_no_update BEFORE UPDATE ON curves
BEGIN SELECT RAISE(ABORT, 'curves is append-only: rows cannot be changed'); END;
CREATE TRIGGER curves_no_delete BEFORE DELETE ON curves
BEGIN SELECT RAISE(ABORT, 'curves is append-only: rows cannot be deleted'); END;

CREATE TRIGGER curve_points_no_update BEFORE UPDATE ON curve_points
BEGIN SELECT RAISE(ABORT, 'curve_points is append-only: rows cannot be changed'); END;
CREATE TRIGGER curve_points_no_delete BEFORE DELETE ON curve_points
BEGIN SELECT RAISE(ABORT, 'curve_points is append-only: rows cannot be deleted'); END;

CREATE TRIGGER curve_reviews_no_update BEFORE UPDATE ON curve_reviews
BEGIN SELECT RAISE(ABORT, 'curve_reviews is append-only: rows cannot be changed'); END;
CREATE TRIGGER curve_reviews_no_delete BEFORE DELETE ON curve_reviews
BEGIN SELECT RAISE(ABORT, 'curve_reviews is append-only: rows cannot be deleted'); END;

CREATE TRIGGER curve_retirements_no_update BEFORE UPDATE ON curve_retirements
BEGIN SELECT RAISE(ABORT, 'curve_retirements is append-only: rows cannot be changed'); END;
CREATE TRIGGER curve_retirements_no_delete BEFORE DELETE ON curve_retirements
BEGIN SELECT RAISE(ABORT, 'curve_retirements is append-only: rows cannot be deleted'); END;

CREATE TRIGGER refusals_no_update BEFORE UPDATE ON refusals
BEGIN SELECT RAISE(ABORT, 'refusals is append-only: rows cannot be changed'); END;
CREATE TRIGGER refusals_no_delete BEFORE DELETE ON refusals
BEGIN SELECT RAISE(ABORT, 'refusals is append-only: rows cannot be deleted'); END;

CREATE TRIGGER checks_no_update BEFORE UPDATE ON checks
BEGIN SELECT RAISE(ABORT, 'checks is append-only: rows cannot be changed'); END;
CREATE TRIGGER checks_no_delete BEFORE DELETE ON checks
BEGIN SELECT RAISE(ABORT, 'checks is append-only: rows cannot be deleted'); END;

CREATE TRIGGER results_no_update BEFORE UPDATE ON results
BEGIN SELECT RAISE(ABORT, 'results is append-only: rows cannot be changed'); END;
CREATE TRIGGER results_no_delete BEFORE DELETE ON results
BEGIN SELECT RAISE(ABORT, 'results is append-only: rows cannot be deleted'); END;

CREATE TRIGGER schema_migrations_no_update BEFORE UPDATE ON schema_migrations
BEGIN SELECT RAISE(ABORT, 'schema_migrations is append-only: rows cannot be changed'); END;
CREATE TRIGGER schema_migrations_no_delete BEFORE DELETE ON schema_migrations
BEGIN SELECT RAISE(ABORT, 'schema_migrations is append-only: rows cannot be deleted'); END;
