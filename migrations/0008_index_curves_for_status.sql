-- SPDX-License-Identifier: Apache-2.0
-- Indexes for the questions status asks of a large store.
--
-- The curves of a group (method, instrument, analyte) that can still be active at a moment are
-- those whose expiry moment lies after it. With the expiry in the group's index, that question
-- reads only the group's live curves instead of walking its whole history (which grows with
-- every calibration: status, quantify by method and run import ask it for every group).
CREATE INDEX curves_by_group_expiry ON curves (method_id, instrument_id, analyte, expires_at);

-- The (method, analyte) pairs an instrument has had curves for, read from the index alone
-- instead of a table lookup per curve of its history (status).
CREATE INDEX curves_by_instrument_group ON curves (instrument_id, method_id, analyte);

-- Failed checks by time: an instrument's recent failures are found among the failures, not by
-- walking back through every check of the lab (status).
CREATE INDEX checks_failed_by_time ON checks (occurred_at) WHERE passed = 0;

-- The settled curves of an instrument counted from the index alone: no read of the wide curve
-- rows (fit statistics) for every curve of its history (status).
CREATE INDEX curves_by_instrument_settled
  ON curves (instrument_id, expires_at, verdict, calibration_id);
