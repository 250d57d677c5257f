-- SPDX-License-Identifier: Apache-2.0
-- The curves of a group (method, instrument, analyte) that can still be active at a moment are
-- those whose expiry moment lies after it. With the expiry in the group's index, that question
-- reads only the group's live curves instead of walking its whole history (which grows with
-- every calibration: status, quantify by method and run import ask it for every group).
CREATE INDEX curves_by_group_expiry ON curves (method_id, instrument_id, analyte, expires_at);
