PRAGMA foreign_keys=OFF;
BEGIN TRANSACTION;
CREATE TABLE schema_migrations (
  version    INTEGER PRIMARY KEY,
  name       TEXT    NOT NULL,
  sha256     TEXT    NOT NULL CHECK (length(sha256) = 64),
  applied_at TEXT    NOT NULL
) STRICT;
INSERT INTO schema_migrations VALUES(1,'0001_create_audit_and_registries','5f00b873b46bba265ea8230448d588a8e88bef32ad41649f7b5af84b48a2a9f9','2026-11-30T07:30:00Z');
INSERT INTO schema_migrations VALUES(2,'0002_create_calibrations_and_curves','965ac4aba6df4b9da8a9356b94e9d94f2775df450c2fab480842abdb1006d7a6','2026-11-30T07:30:00Z');
INSERT INTO schema_migrations VALUES(3,'0003_create_checks_and_results','ec028cfec3a43e498aa2e50b7a4737d62d563372c8c23d1f05e6b37e34c8fa91','2026-11-30T07:30:00Z');
INSERT INTO schema_migrations VALUES(4,'0004_forbid_updates_and_deletes','adb9f4b1c9277e6c62c35835187113acf54377a43db5ca2c0df9e70deef94456','2026-11-30T07:30:00Z');
CREATE TABLE audit_log (
  seq              INTEGER PRIMARY KEY,           -- 1, 2, 3, ... without gaps
  recorded_at      TEXT    NOT NULL,              -- when the entry was written (UTC)
  occurred_at      TEXT    NOT NULL,              -- when the recorded event happened (--at)
  actor            TEXT    NOT NULL,
  action           TEXT    NOT NULL,              -- e.g. 'lot.withdraw'
  entity_kind      TEXT    NOT NULL,              -- e.g. 'lot'
  entity_id        TEXT    NOT NULL,              -- the id people use: a code or a number
  reason           TEXT,
  clock_overridden INTEGER NOT NULL CHECK (clock_overridden IN (0, 1)),
  tool_version     TEXT    NOT NULL,
  payload          TEXT    NOT NULL,              -- canonical JSON of the rows written
  prev_hash        TEXT    NOT NULL CHECK (length(prev_hash) = 64),
  hash             TEXT    NOT NULL CHECK (length(hash) = 64)
) STRICT;
INSERT INTO audit_log VALUES(1,'2026-11-30T07:30:00Z','2026-11-30T07:30:00Z','r.okafor','lab.init','lab','Millbrook Water Laboratory',NULL,1,'curvewarden 0.1.0','{"lab_settings":[{"audit_seq":1,"id":1,"lab_name":"Millbrook Water Laboratory","time_zone":"Europe/Berlin"}]}','0000000000000000000000000000000000000000000000000000000000000000','9d10c4f1099de2b66ec1a43445f5b9ef3d57e5319f6b3eea1b25a0cb4d992d74');
INSERT INTO audit_log VALUES(2,'2026-11-30T07:30:00Z','2026-11-30T07:30:00Z','r.okafor','instrument.add','instrument','IC-02',NULL,1,'curvewarden 0.1.0','{"instruments":[{"audit_seq":2,"code":"IC-02","id":1,"name":"Ion chromatograph, bay 2","registered_at":"2026-11-30T07:30:00Z"}]}','9d10c4f1099de2b66ec1a43445f5b9ef3d57e5319f6b3eea1b25a0cb4d992d74','9d5e1002e1715261a33e051a8721a185ff6767290652d360279694f2938008cd');
INSERT INTO audit_log VALUES(3,'2026-11-30T07:30:00Z','2026-11-30T07:30:00Z','r.okafor','method.add','method','ANION-IC',NULL,1,'curvewarden 0.1.0','{"method_versions":[{"audit_seq":3,"definition":"{\"analytes\":[\"nitrate\",\"sulfate\"],\"calibration\":{\"max_error_pct\":15.0,\"max_error_pct_lowest\":20.0,\"max_rf_rsd_pct\":null,\"min_levels\":5,\"min_levels_within\":0.75,\"min_r2\":0.995,\"model\":\"linear\",\"review_required\":true,\"valid_for\":\"7 days\",\"weighting\":\"1/x\"},\"check\":{\"blank_limit\":null,\"check_every\":\"12 hours\",\"samples_per_check\":10,\"tolerance_pct\":10.0,\"trend_rules\":[\"1-3s\",\"2-2s\",\"R-4s\"]},\"code\":\"ANION-IC\",\"internal_standard\":null,\"title\":\"Nitrate and sulfate in drinking water by ion chromatography\",\"unit\":\"mg/L\"}","effective_at":"2026-11-30T07:30:00Z","id":1,"method_id":1,"reason":null,"source_name":"anion-ic.toml","source_sha256":"2f1892c14888d875b5bdd71ca17ab857713ccbea6c496b6acc381d3921057c0e","source_text":"# Demo method of the fictional Millbrook Water Laboratory: anions by ion chromatography.\n# The limits are illustrative; your SOP and method validation decide the real ones.\ncode = \"ANION-IC\"\ntitle = \"Nitrate and sulfate in drinking water by ion chromatography\"\nunit = \"mg/L\"\nanalytes = [\"nitrate\", \"sulfate\"]\n\n[calibration]\nmodel = \"linear\"\nweighting = \"1/x\"\nmin_levels = 5\nmin_r2 = 0.995\nmax_error_pct = 15.0\nmax_error_pct_lowest = 20.0\nmin_levels_within = 0.75\nvalid_for = \"7 days\"\nreview_required = true\n\n[check]\ntolerance_pct = 10.0\nsamples_per_check = 10\ncheck_every = \"12 hours\"\ntrend_rules = [\"1-3s\", \"2-2s\", \"R-4s\"]\n","title":"Nitrate and sulfate in drinking water by ion chromatography","unit":"mg/L","version":1}],"methods":[{"audit_seq":3,"code":"ANION-IC","id":1,"registered_at":"2026-11-30T07:30:00Z"}]}','9d5e1002e1715261a33e051a8721a185ff6767290652d360279694f2938008cd','5eb3e9f3d85ee38a07ae3bbbf83b3c40c2868d26f09300ed600c44a9acc0d23d');
INSERT INTO audit_log VALUES(4,'2026-11-30T07:30:00Z','2026-11-30T07:30:00Z','r.okafor','lot.add','lot','CRM-AN-0419',NULL,1,'curvewarden 0.1.0','{"lot_values":[{"analyte":"nitrate","audit_seq":4,"id":1,"lot_id":1,"uncertainty":4.0,"value":1000.0},{"analyte":"sulfate","audit_seq":4,"id":2,"lot_id":1,"uncertainty":5.0,"value":1000.0}],"lots":[{"audit_seq":4,"certificate":"CoA 0419-B","code":"CRM-AN-0419","expires_on":"2027-06-30","id":1,"in_use_days":60,"material":"Anion multi-element standard 1000 mg/L","opened_on":"2026-11-02","registered_at":"2026-11-30T07:30:00Z"}]}','5eb3e9f3d85ee38a07ae3bbbf83b3c40c2868d26f09300ed600c44a9acc0d23d','11cf378ec790c2aaf93956e1fc18c31402fbf96c255ae35a888ab4c54aca16ee');
INSERT INTO audit_log VALUES(5,'2026-11-30T07:30:00Z','2026-11-30T07:30:00Z','r.okafor','lot.add','lot','CRM-AN-0388',NULL,1,'curvewarden 0.1.0','{"lot_values":[{"analyte":"nitrate","audit_seq":5,"id":3,"lot_id":2,"uncertainty":3.0,"value":500.0},{"analyte":"sulfate","audit_seq":5,"id":4,"lot_id":2,"uncertainty":3.0,"value":500.0}],"lots":[{"audit_seq":5,"certificate":null,"code":"CRM-AN-0388","expires_on":"2026-12-03","id":2,"in_use_days":null,"material":"Anion standard, second source","opened_on":null,"registered_at":"2026-11-30T07:30:00Z"}]}','11cf378ec790c2aaf93956e1fc18c31402fbf96c255ae35a888ab4c54aca16ee','10c03c0e563f65c46eb776feb623429e43c53c31dd8faacc5942b058d77d4b8e');
INSERT INTO audit_log VALUES(6,'2026-11-30T08:15:00Z','2026-11-30T08:15:00Z','r.okafor','calibration.log','calibration','1','Monday calibration',1,'curvewarden 0.1.0','{"calibration_lots":[{"audit_seq":6,"calibration_id":1,"id":1,"lot_id":1}],"calibrations":[{"acquired_at":"2026-11-30T08:15:00Z","analyst":"r.okafor","audit_seq":6,"id":1,"instrument_id":1,"method_version_id":1,"note":"Monday calibration","points_file":"ical-2026-11-30.csv","points_sha256":"ee3eca062e2c672b959f1ee57c3871199411f62ae4f00407362dc98bc0a458eb"}]}','10c03c0e563f65c46eb776feb623429e43c53c31dd8faacc5942b058d77d4b8e','405897007c81c08d69a2bdee8765adc2a4db84ed1e6fa9bda6bf17cfba2505ca');
INSERT INTO audit_log VALUES(7,'2026-11-30T08:15:00Z','2026-11-30T08:15:00Z','r.okafor','curve.log','curve','1','nitrate: accepted',1,'curvewarden 0.1.0','{"curve_points":[{"audit_seq":7,"back_calculated":0.507011147608757,"curve_id":1,"error_pct":1.402229521751397,"exclude_reason":null,"excluded":0,"id":1,"is_response":null,"level":"1","nominal":0.5,"replicate":1,"response":0.0512,"source_line":2,"within_limits":1,"y":0.0512},{"audit_seq":7,"back_calculated":0.49302396610003346,"curve_id":1,"error_pct":-1.3952067799933077,"exclude_reason":null,"excluded":0,"id":2,"is_response":null,"level":"1","nominal":0.5,"replicate":2,"response":0.0498,"source_line":3,"within_limits":1,"y":0.0498},{"audit_seq":7,"back_calculated":1.0045551755619193,"curve_id":1,"error_pct":0.45551755619193113,"exclude_reason":null,"excluded":0,"id":3,"is_response":null,"level":"2","nominal":1.0,"replicate":1,"response":0.101,"source_line":4,"within_limits":1,"y":0.101},{"audit_seq":7,"back_calculated":0.9895689096597157,"curve_id":1,"error_pct":-1.0431090340284332,"exclude_reason":null,"excluded":0,"id":4,"is_response":null,"level":"2","nominal":1.0,"replicate":2,"response":0.0995,"source_line":5,"within_limits":1,"y":0.0995},{"audit_seq":7,"back_calculated":5.0408561252221125,"curve_id":1,"error_pct":0.8171225044422492,"exclude_reason":null,"excluded":0,"id":5,"is_response":null,"level":"3","nominal":5.0,"replicate":1,"response":0.505,"source_line":6,"within_limits":1,"y":0.505},{"audit_seq":7,"back_calculated":4.977913808432856,"curve_id":1,"error_pct":-0.44172383134288395,"exclude_reason":null,"excluded":0,"id":6,"is_response":null,"level":"3","nominal":5.0,"replicate":2,"response":0.4987,"source_line":7,"within_limits":1,"y":0.4987},{"audit_seq":7,"back_calculated":10.106214000166956,"curve_id":1,"error_pct":1.0621400016695581,"exclude_reason":null,"excluded":0,"id":7,"is_response":null,"level":"4","nominal":10.0,"replicate":1,"response":1.012,"source_line":8,"within_limits":1,"y":1.012},{"audit_seq":7,"back_calculated":9.936369653275316,"curve_id":1,"error_pct":-0.6363034672468437,"exclude_reason":null,"excluded":0,"id":8,"is_response":null,"level":"4","nominal":10.0,"replicate":2,"response":0.995,"source_line":9,"within_limits":1,"y":0.995},{"audit_seq":7,"back_calculated":25.072498214501035,"curve_id":1,"error_pct":0.28999285800414043,"exclude_reason":null,"excluded":0,"id":9,"is_response":null,"level":"5","nominal":25.0,"replicate":1,"response":2.51,"source_line":10,"within_limits":1,"y":2.51},{"audit_seq":7,"back_calculated":24.87268133580499,"curve_id":1,"error_pct":-0.5092746567800361,"exclude_reason":null,"excluded":0,"id":10,"is_response":null,"level":"5","nominal":25.0,"replicate":2,"response":2.49,"source_line":11,"within_limits":1,"y":2.49},{"audit_seq":7,"back_calculated":49.74988273346311,"curve_id":1,"error_pct":-0.5002345330737796,"exclude_reason":null,"excluded":0,"id":11,"is_response":null,"level":"6","nominal":50.0,"replicate":1,"response":4.98,"source_line":12,"within_limits":1,"y":4.98},{"audit_seq":7,"back_calculated":50.249424930203226,"curve_id":1,"error_pct":0.49884986040645174,"exclude_reason":null,"excluded":0,"id":12,"is_response":null,"level":"6","nominal":50.0,"replicate":2,"response":5.03,"source_line":13,"within_limits":1,"y":5.03}],"curves":[{"acceptance":"{\"accepted\":true,\"failures\":[],\"warnings\":[]}","acquired_at":"2026-11-30T08:15:00Z","analyte":"nitrate","audit_seq":7,"calibration_id":1,"dof":10,"expires_at":"2026-12-07T08:15:00Z","failed_criteria":"[]","id":1,"instrument_id":1,"intercept":0.0004524204244031327,"lod":0.1047615243618361,"loq":0.3174591647328367,"method_id":1,"model":"linear","n_levels":6,"n_points":12,"quadratic":0.0,"r2":0.999965071170606,"range_high":50.0,"range_low":0.5,"residual_sd":0.0031775009879494594,"rf_rsd_pct":0.9182587665408771,"se_intercept":0.0009761989442668089,"se_quadratic":0.0,"se_slope":0.00018706710501429987,"slope":0.10009164456233421,"statistics":"{\"covariance\":[[9.529643787876323e-07,-6.248946746148409e-08,0.0],[-6.248946746148409e-08,3.499410177843109e-08,0.0],[0.0,0.0,0.0]],\"dof\":10,\"intercept\":0.0004524204244031327,\"lod\":0.1047615243618361,\"loq\":0.3174591647328367,\"mandel\":{\"dof_quadratic\":9,\"ds2\":3.3467120049275557e-07,\"f_critical_99\":10.561431047395386,\"linear_adequate\":true,\"s_y1\":0.0031775009879494594,\"s_y2\":0.0033438243920481422,\"test_value\":0.029931702404218136},\"model\":\"linear\",\"n_levels\":6,\"n_points\":12,\"quadratic\":0.0,\"r2\":0.999965071170606,\"r2_definition\":\"weighted, centred: 1 - sum(w*e^2)/sum(w*(y - ybar_w)^2)\",\"range_high\":50.0,\"range_low\":0.5,\"residual_sd\":0.0031775009879494594,\"rf_mean\":0.10034499999999998,\"rf_rsd_pct\":0.9182587665408771,\"rf_sd\":0.0009214267592854429,\"se_intercept\":0.0009761989442668089,\"se_quadratic\":0.0,\"se_slope\":0.00018706710501429987,\"slope\":0.10009164456233421,\"sse\":0.0001009651252841979,\"sum_raw_weights\":6.719999999999999,\"sum_x2_w\":326.78571428571433,\"sxx_w\":288.52040816326536,\"weighting\":\"1/x\",\"weights_normalisation\":\"weights scaled to sum to the number of fitted points\",\"xbar_w\":1.7857142857142858,\"ybar_w\":0.17918750000000006}","verdict":"accepted","weighting":"1/x"}]}','405897007c81c08d69a2bdee8765adc2a4db84ed1e6fa9bda6bf17cfba2505ca','01a6c4efb24f4797b497c4b1f14247f64b1300facb012182d882c5988dee5a86');
INSERT INTO audit_log VALUES(8,'2026-11-30T08:15:00Z','2026-11-30T08:15:00Z','r.okafor','curve.log','curve','2','sulfate: accepted',1,'curvewarden 0.1.0','{"curve_points":[{"audit_seq":8,"back_calculated":1.005663914074216,"curve_id":2,"error_pct":0.566391407421607,"exclude_reason":null,"excluded":0,"id":13,"is_response":null,"level":"1","nominal":1.0,"replicate":1,"response":0.0301,"source_line":14,"within_limits":1,"y":0.0301},{"audit_seq":8,"back_calculated":4.983103435885147,"curve_id":2,"error_pct":-0.3379312822970526,"exclude_reason":null,"excluded":0,"id":14,"is_response":null,"level":"2","nominal":5.0,"replicate":1,"response":0.1488,"source_line":15,"within_limits":1,"y":0.1488},{"audit_seq":8,"back_calculated":10.006003051044868,"curve_id":2,"error_pct":0.060030510448676466,"exclude_reason":null,"excluded":0,"id":15,"is_response":null,"level":"3","nominal":10.0,"replicate":1,"response":0.2987,"source_line":16,"within_limits":1,"y":0.2987},{"audit_seq":8,"back_calculated":24.860248544042218,"curve_id":2,"error_pct":-0.5590058238311286,"exclude_reason":null,"excluded":0,"id":16,"is_response":null,"level":"4","nominal":25.0,"replicate":1,"response":0.742,"source_line":17,"within_limits":1,"y":0.742},{"audit_seq":8,"back_calculated":7.033813618992384,"curve_id":2,"error_pct":-71.86474552403047,"exclude_reason":"air bubble in the loop (injection log 2026-11-30)","excluded":1,"id":17,"is_response":null,"level":"4","nominal":25.0,"replicate":2,"response":0.21,"source_line":18,"within_limits":0,"y":0.21},{"audit_seq":8,"back_calculated":50.12553413330458,"curve_id":2,"error_pct":0.2510682666091668,"exclude_reason":null,"excluded":0,"id":18,"is_response":null,"level":"5","nominal":50.0,"replicate":1,"response":1.496,"source_line":19,"within_limits":1,"y":1.496},{"audit_seq":8,"back_calculated":100.01944692164896,"curve_id":2,"error_pct":0.019446921648963666,"exclude_reason":null,"excluded":0,"id":19,"is_response":null,"level":"6","nominal":100.0,"replicate":1,"response":2.985,"source_line":20,"within_limits":1,"y":2.985}],"curves":[{"acceptance":"{\"accepted\":true,\"failures\":[],\"warnings\":[]}","acquired_at":"2026-11-30T08:15:00Z","analyte":"sulfate","audit_seq":8,"calibration_id":1,"dof":4,"expires_at":"2026-12-07T08:15:00Z","failed_criteria":"[]","id":2,"instrument_id":1,"intercept":8.765010856554012e-05,"lod":0.11926475116585601,"loq":0.36140833686623036,"method_id":1,"model":"linear","n_levels":6,"n_points":6,"quadratic":0.0,"r2":0.9999927578213439,"range_high":100.0,"range_low":1.0,"residual_sd":0.0010785624608690345,"rf_rsd_pct":0.4823206795689309,"se_intercept":0.00047414342033001315,"se_quadratic":0.0,"se_slope":4.015626653761746e-05,"slope":0.029843319891877523,"statistics":"{\"covariance\":[[2.2481198304224352e-07,-7.062156535358437e-09,0.0],[-7.062156535358437e-09,1.6125257422401758e-09,0.0],[0.0,0.0,0.0]],\"dof\":4,\"intercept\":8.765010856554012e-05,\"lod\":0.11926475116585601,\"loq\":0.36140833686623036,\"mandel\":{\"dof_quadratic\":3,\"ds2\":4.818483464140001e-07,\"f_critical_99\":34.11622156452979,\"linear_adequate\":true,\"s_y1\":0.0010785624608690345,\"s_y2\":0.0011791719667588027,\"test_value\":0.3465421625295041},\"model\":\"linear\",\"n_levels\":6,\"n_points\":6,\"quadratic\":0.0,\"r2\":0.9999927578213439,\"r2_definition\":\"weighted, centred: 1 - sum(w*e^2)/sum(w*(y - ybar_w)^2)\",\"range_high\":100.0,\"range_low\":1.0,\"residual_sd\":0.0010785624608690345,\"rf_mean\":0.02986333333333333,\"rf_rsd_pct\":0.4823206795689309,\"rf_sd\":0.00014403703227526836,\"se_intercept\":0.00047414342033001315,\"se_quadratic\":0.0,\"se_slope\":4.015626653761746e-05,\"slope\":0.029843319891877523,\"sse\":4.653187927983469e-06,\"sum_raw_weights\":1.37,\"sum_x2_w\":836.4963503649633,\"sxx_w\":721.4129681922318,\"weighting\":\"1/x\",\"weights_normalisation\":\"weights scaled to sum to the number of fitted points\",\"xbar_w\":4.37956204379562,\"ybar_w\":0.1307883211678832}","verdict":"accepted","weighting":"1/x"}]}','01a6c4efb24f4797b497c4b1f14247f64b1300facb012182d882c5988dee5a86','715e440ba30f20aba95e454ed63f7a85ff48afa701c13650471351659f06da40');
INSERT INTO audit_log VALUES(9,'2026-11-30T08:15:00Z','2026-11-30T08:15:00Z','r.okafor','calibration.log','calibration','2',NULL,1,'curvewarden 0.1.0','{"calibration_lots":[{"audit_seq":9,"calibration_id":2,"id":2,"lot_id":1}],"calibrations":[{"acquired_at":"2026-11-30T08:15:00Z","analyst":"r.okafor","audit_seq":9,"id":2,"instrument_id":1,"method_version_id":1,"note":null,"points_file":"ical-poor.csv","points_sha256":"5edf2a15c46ac1964b760dbf377e304fe758c6c18f94f346507f90955688ac60"}]}','715e440ba30f20aba95e454ed63f7a85ff48afa701c13650471351659f06da40','f4a11d1a163a0f5ebdb1b5d6bfad5960afdc3722c6c06372809dc4ef2c5106cd');
INSERT INTO audit_log VALUES(10,'2026-11-30T08:15:00Z','2026-11-30T08:15:00Z','r.okafor','curve.log','curve','3','nitrate: rejected too-few-levels',1,'curvewarden 0.1.0','{"curve_points":[{"audit_seq":10,"back_calculated":0.5610648830840532,"curve_id":3,"error_pct":12.212976616810645,"exclude_reason":null,"excluded":0,"id":20,"is_response":null,"level":"1","nominal":0.5,"replicate":1,"response":0.07,"source_line":2,"within_limits":1,"y":0.07},{"audit_seq":10,"back_calculated":0.8749341689488098,"curve_id":3,"error_pct":-12.506583105119018,"exclude_reason":null,"excluded":0,"id":21,"is_response":null,"level":"2","nominal":1.0,"replicate":1,"response":0.101,"source_line":3,"within_limits":1,"y":0.101},{"audit_seq":10,"back_calculated":4.965359700863702,"curve_id":3,"error_pct":-0.692805982725968,"exclude_reason":null,"excluded":0,"id":22,"is_response":null,"level":"3","nominal":5.0,"replicate":1,"response":0.505,"source_line":4,"within_limits":1,"y":0.505},{"audit_seq":10,"back_calculated":10.098641247103432,"curve_id":3,"error_pct":0.986412471034317,"exclude_reason":null,"excluded":0,"id":23,"is_response":null,"level":"4","nominal":10.0,"replicate":1,"response":1.012,"source_line":5,"within_limits":1,"y":1.012}],"curves":[{"acceptance":"{\"accepted\":false,\"failures\":[{\"criterion\":\"too-few-levels\",\"detail\":\"4 distinct levels fitted, at least 5 required\",\"level\":null,\"limit\":5.0,\"value\":4.0}],\"warnings\":[]}","acquired_at":"2026-11-30T08:15:00Z","analyte":"nitrate","audit_seq":10,"calibration_id":2,"dof":2,"expires_at":"2026-12-07T08:15:00Z","failed_criteria":"[\"too-few-levels\"]","id":3,"instrument_id":1,"intercept":0.01458517555266578,"lod":0.4005760735104735,"loq":1.2138668894256772,"method_id":1,"model":"linear","n_levels":4,"n_points":4,"quadratic":0.0,"r2":0.9979177234577918,"range_high":10.0,"range_low":0.5,"residual_sd":0.011989027046249552,"rf_rsd_pct":17.569399797680617,"se_intercept":0.007133533650411116,"se_quadratic":0.0,"se_slope":0.003190213232420295,"slope":0.09876723016905074,"statistics":"{\"covariance\":[[5.0887302341547735e-05,-1.2336315719163087e-05,0.0],[-1.2336315719163087e-05,1.0177460468309547e-05,0.0],[0.0,0.0,0.0]],\"dof\":2,\"intercept\":0.01458517555266578,\"lod\":0.4005760735104735,\"loq\":1.2138668894256772,\"mandel\":{\"dof_quadratic\":1,\"ds2\":8.172010618283664e-05,\"f_critical_99\":4052.1806954768217,\"linear_adequate\":true,\"s_y1\":0.011989027046249552,\"s_y2\":0.01434410794886074,\"test_value\":0.397174934344745},\"model\":\"linear\",\"n_levels\":4,\"n_points\":4,\"quadratic\":0.0,\"r2\":0.9979177234577918,\"r2_definition\":\"weighted, centred: 1 - sum(w*e^2)/sum(w*(y - ybar_w)^2)\",\"range_high\":10.0,\"range_low\":0.5,\"residual_sd\":0.011989027046249552,\"rf_mean\":0.11080000000000001,\"rf_rsd_pct\":17.569399797680617,\"rf_sd\":0.019466894975830127,\"se_intercept\":0.007133533650411116,\"se_quadratic\":0.0,\"se_slope\":0.003190213232420295,\"slope\":0.09876723016905074,\"sse\":0.0002874735390314065,\"sum_raw_weights\":3.3000000000000003,\"sum_x2_w\":20.0,\"sxx_w\":14.123048668503216,\"weighting\":\"1/x\",\"weights_normalisation\":\"weights scaled to sum to the number of fitted points\",\"xbar_w\":1.212121212121212,\"ybar_w\":0.1343030303030303}","verdict":"rejected","weighting":"1/x"}]}','f4a11d1a163a0f5ebdb1b5d6bfad5960afdc3722c6c06372809dc4ef2c5106cd','f341dd8aac64841578b22f4c89e34d0b51a670a0717b20918af4701a8642ab9f');
INSERT INTO audit_log VALUES(11,'2026-11-30T08:15:00Z','2026-11-30T08:15:00Z','r.okafor','curve.review-refused','curve','1','curve 1 was logged by r.okafor; a second person must review it (the reviewer cannot be the analyst)',1,'curvewarden 0.1.0','{"refusals":[{"action":"curve.review","actor":"r.okafor","audit_seq":11,"entity_id":"1","entity_kind":"curve","id":1,"message":"curve 1 was logged by r.okafor; a second person must review it (the reviewer cannot be the analyst)","occurred_at":"2026-11-30T08:15:00Z","reasons":"[\"self-review\"]"}]}','f341dd8aac64841578b22f4c89e34d0b51a670a0717b20918af4701a8642ab9f','03bb7ea7b617f729c40101e33a476a753226ea9ee5df09bf33c54a0d9010189f');
INSERT INTO audit_log VALUES(12,'2026-11-30T08:15:00Z','2026-11-30T08:15:00Z','j.lindqvist','curve.approve','curve','1','fit checked',1,'curvewarden 0.1.0','{"curve_reviews":[{"audit_seq":12,"curve_id":1,"decision":"approve","id":1,"occurred_at":"2026-11-30T08:15:00Z","reason":"fit checked","reviewer":"j.lindqvist"}]}','03bb7ea7b617f729c40101e33a476a753226ea9ee5df09bf33c54a0d9010189f','cf1a1809e342880719eae39c0b5b111392f8c51033378cb9cbf30f5beacfa619');
INSERT INTO audit_log VALUES(13,'2026-11-30T08:15:00Z','2026-11-30T08:15:00Z','j.lindqvist','curve.approve','curve','2','fit checked',1,'curvewarden 0.1.0','{"curve_reviews":[{"audit_seq":13,"curve_id":2,"decision":"approve","id":2,"occurred_at":"2026-11-30T08:15:00Z","reason":"fit checked","reviewer":"j.lindqvist"}]}','cf1a1809e342880719eae39c0b5b111392f8c51033378cb9cbf30f5beacfa619','1d0c26456a97f23ffe5ed067d6e93b18d32cd5c2c2e1c1690173da841e59c861');
INSERT INTO audit_log VALUES(14,'2026-11-30T09:00:00Z','2026-11-30T09:00:00Z','r.okafor','check.log','check','1','check passed on curve 1',1,'curvewarden 0.1.0','{"checks":[{"analyst":"r.okafor","audit_seq":14,"curve_id":1,"id":1,"is_response":null,"kind":"check","limit_high":110.0,"limit_low":90.0,"measured":10.016296404753733,"nominal":10.0,"occurred_at":"2026-11-30T09:00:00Z","passed":1,"recovery_pct":100.16296404753733,"response":1.003}]}','1d0c26456a97f23ffe5ed067d6e93b18d32cd5c2c2e1c1690173da841e59c861','4a3cd988e83b9660c9a7f8445e401c6f400646d75dbbe1a137be5d9a16e325bd');
INSERT INTO audit_log VALUES(15,'2026-11-30T09:00:00Z','2026-11-30T09:00:00Z','r.okafor','result.report','result','1','MW-1187 nitrate: reported',1,'curvewarden 0.1.0','{"results":[{"analyst":"r.okafor","analyte":"nitrate","audit_seq":15,"ci_high":7.556074844721779,"ci_low":7.261297430818807,"concentration":7.408686137770293,"curve_id":1,"dilution":1.0,"flags":"[]","id":1,"instrument_id":1,"is_response":null,"method_id":1,"occurred_at":"2026-11-30T09:00:00Z","reason_details":"[]","reasons":"[]","replicates":1,"response":0.742,"sample":"MW-1187","sd_x0":0.06614879805183442,"status":"reported","x0":7.408686137770293}]}','4a3cd988e83b9660c9a7f8445e401c6f400646d75dbbe1a137be5d9a16e325bd','caef613241aa43fdd28c4c7a21c2b1b9e49f3c120f09718b62bf8562d3062709');
INSERT INTO audit_log VALUES(16,'2026-11-30T09:00:00Z','2026-11-30T09:00:00Z','r.okafor','result.report','result','2','MW-1188 nitrate: reported',1,'curvewarden 0.1.0','{"results":[{"analyst":"r.okafor","analyte":"nitrate","audit_seq":16,"ci_high":0.682782164895433,"ci_low":0.5380022356075563,"concentration":0.6103922002514947,"curve_id":1,"dilution":2.0,"flags":"[\"below-range\"]","id":2,"instrument_id":1,"is_response":null,"method_id":1,"occurred_at":"2026-11-30T09:00:00Z","reason_details":"[]","reasons":"[]","replicates":1,"response":0.031,"sample":"MW-1188","sd_x0":0.01624449135640858,"status":"reported","x0":0.3051961001257473}]}','caef613241aa43fdd28c4c7a21c2b1b9e49f3c120f09718b62bf8562d3062709','2823ee96df1b338ef0e0b295b92d21af43676d1b662795279a0e243f7faa5857');
INSERT INTO audit_log VALUES(17,'2026-11-30T09:00:00Z','2026-11-30T09:00:00Z','r.okafor','result.refuse','result','3','MW-1189 nitrate: refused above-range',1,'curvewarden 0.1.0','{"results":[{"analyst":"r.okafor","analyte":"nitrate","audit_seq":17,"ci_high":null,"ci_low":null,"concentration":null,"curve_id":1,"dilution":1.0,"flags":"[]","id":3,"instrument_id":1,"is_response":null,"method_id":1,"occurred_at":"2026-11-30T09:00:00Z","reason_details":"[{\"message\":\"response 6.9 gives about 68.9 mg/L, above the highest calibrator (50 mg/L): dilute and re-run (e.g. a 2-fold dilution)\",\"reason\":\"above-range\",\"since\":null}]","reasons":"[\"above-range\"]","replicates":1,"response":6.9,"sample":"MW-1189","sd_x0":0.23395743342503034,"status":"refused","x0":68.93230308828382}]}','2823ee96df1b338ef0e0b295b92d21af43676d1b662795279a0e243f7faa5857','afeaff077af09790ffe92560573b343bd12e03e7b2598d2b32e5d5e118c1d2ac');
INSERT INTO audit_log VALUES(18,'2026-11-30T13:00:00Z','2026-11-30T13:00:00Z','r.okafor','result.report','result','4','MW-1190 nitrate: reported',1,'curvewarden 0.1.0','{"results":[{"analyst":"r.okafor","analyte":"nitrate","audit_seq":18,"ci_high":15.396191766218651,"ci_low":14.966933671874555,"concentration":15.181562719046603,"curve_id":1,"dilution":1.0,"flags":"[]","id":4,"instrument_id":1,"is_response":null,"method_id":1,"occurred_at":"2026-11-30T13:00:00Z","reason_details":"[]","reasons":"[]","replicates":1,"response":1.52,"sample":"MW-1190","sd_x0":0.09632660324589606,"status":"reported","x0":15.181562719046603}]}','afeaff077af09790ffe92560573b343bd12e03e7b2598d2b32e5d5e118c1d2ac','dee9ed7f965f0482c1055fffb5dfbae426caed79b136c54b3f2e6d64e98856ed');
INSERT INTO audit_log VALUES(19,'2026-11-30T13:00:00Z','2026-11-30T13:00:00Z','r.okafor','check.log','check','2','check FAILED on curve 1',1,'curvewarden 0.1.0','{"checks":[{"analyst":"r.okafor","audit_seq":19,"curve_id":1,"id":2,"is_response":null,"kind":"check","limit_high":110.0,"limit_low":90.0,"measured":8.597596566011784,"nominal":10.0,"occurred_at":"2026-11-30T13:00:00Z","passed":0,"recovery_pct":85.97596566011785,"response":0.861}]}','dee9ed7f965f0482c1055fffb5dfbae426caed79b136c54b3f2e6d64e98856ed','c3a599cb234342b81c72c7bf1ffa0700c1906b71eb0b85f85a82e11724d1a056');
INSERT INTO audit_log VALUES(20,'2026-11-30T13:00:00Z','2026-11-30T13:00:00Z','r.okafor','result.refuse','result','5','MW-1191 nitrate: refused no-active-curve check-failed',1,'curvewarden 0.1.0','{"results":[{"analyst":"r.okafor","analyte":"nitrate","audit_seq":20,"ci_high":null,"ci_low":null,"concentration":null,"curve_id":null,"dilution":1.0,"flags":"[]","id":5,"instrument_id":1,"is_response":null,"method_id":1,"occurred_at":"2026-11-30T13:00:00Z","reason_details":"[{\"message\":\"no active curve for method ANION-IC, instrument IC-02, analyte nitrate at 2026-11-30 14:00 +01:00; the latest accepted curve, 1, is stale\",\"reason\":\"no-active-curve\",\"since\":null},{\"message\":\"check 2 at 2026-11-30 14:00 +01:00: measured 8.598 mg/L against nominal 10 (recovery 86.0 %, allowed 90–110 %)\",\"reason\":\"check-failed\",\"since\":\"2026-11-30T13:00:00Z\"}]","reasons":"[\"no-active-curve\",\"check-failed\"]","replicates":1,"response":0.5,"sample":"MW-1191","sd_x0":null,"status":"refused","x0":null}]}','c3a599cb234342b81c72c7bf1ffa0700c1906b71eb0b85f85a82e11724d1a056','8857242f6b602144fae07a2406f7d7722989f91a758f3d9c9aeb1fcd17204e51');
INSERT INTO audit_log VALUES(21,'2026-12-01T07:00:00Z','2026-12-01T07:00:00Z','r.okafor','method.revise','method','ANION-IC','guard column changed',1,'curvewarden 0.1.0','{"method_versions":[{"audit_seq":21,"definition":"{\"analytes\":[\"nitrate\",\"sulfate\"],\"calibration\":{\"max_error_pct\":15.0,\"max_error_pct_lowest\":20.0,\"max_rf_rsd_pct\":null,\"min_levels\":5,\"min_levels_within\":0.75,\"min_r2\":0.995,\"model\":\"linear\",\"review_required\":true,\"valid_for\":\"7 days\",\"weighting\":\"1/x\"},\"check\":{\"blank_limit\":null,\"check_every\":\"12 hours\",\"samples_per_check\":10,\"tolerance_pct\":10.0,\"trend_rules\":[\"1-3s\",\"2-2s\",\"R-4s\"]},\"code\":\"ANION-IC\",\"internal_standard\":null,\"title\":\"Nitrate and sulfate in drinking water by ion chromatography (new guard column)\",\"unit\":\"mg/L\"}","effective_at":"2026-12-01T07:00:00Z","id":2,"method_id":1,"reason":"guard column changed","source_name":"anion-ic-v2.toml","source_sha256":"cbc32d4a16c50670b8a6ec1a97d872f602da0ebc31e351c418321621aa9c1b19","source_text":"# Demo method of the fictional Millbrook Water Laboratory: anions by ion chromatography.\n# The limits are illustrative; your SOP and method validation decide the real ones.\ncode = \"ANION-IC\"\ntitle = \"Nitrate and sulfate in drinking water by ion chromatography (new guard column)\"\nunit = \"mg/L\"\nanalytes = [\"nitrate\", \"sulfate\"]\n\n[calibration]\nmodel = \"linear\"\nweighting = \"1/x\"\nmin_levels = 5\nmin_r2 = 0.995\nmax_error_pct = 15.0\nmax_error_pct_lowest = 20.0\nmin_levels_within = 0.75\nvalid_for = \"7 days\"\nreview_required = true\n\n[check]\ntolerance_pct = 10.0\nsamples_per_check = 10\ncheck_every = \"12 hours\"\ntrend_rules = [\"1-3s\", \"2-2s\", \"R-4s\"]\n","title":"Nitrate and sulfate in drinking water by ion chromatography (new guard column)","unit":"mg/L","version":2}]}','8857242f6b602144fae07a2406f7d7722989f91a758f3d9c9aeb1fcd17204e51','ac39674bf28a569bc26317d4f2190f35e8ce612c3ea3a4a9998f80b868599755');
INSERT INTO audit_log VALUES(22,'2026-12-01T07:00:00Z','2026-12-01T07:00:00Z','r.okafor','check.log-refused','curve','3','curve 3 is rejected (failed acceptance: 4 distinct levels fitted, at least 5 required); checks are not recorded against it',1,'curvewarden 0.1.0','{"refusals":[{"action":"check.log","actor":"r.okafor","audit_seq":22,"entity_id":"3","entity_kind":"curve","id":2,"message":"curve 3 is rejected (failed acceptance: 4 distinct levels fitted, at least 5 required); checks are not recorded against it","occurred_at":"2026-12-01T07:00:00Z","reasons":"[\"rejected\"]"}]}','ac39674bf28a569bc26317d4f2190f35e8ce612c3ea3a4a9998f80b868599755','4a1f0aad1d873985bbd6825d5491b9b8d75ddcb78ab885cb44c14625aae85f63');
INSERT INTO audit_log VALUES(23,'2026-12-01T07:00:00Z','2026-12-01T07:00:00Z','r.okafor','instrument.service-out','instrument','IC-02','pump seal',1,'curvewarden 0.1.0','{"instrument_service_events":[{"audit_seq":23,"direction":"out","id":1,"instrument_id":1,"occurred_at":"2026-12-01T07:00:00Z","reason":"pump seal"}]}','4a1f0aad1d873985bbd6825d5491b9b8d75ddcb78ab885cb44c14625aae85f63','f7af39dc1e981ec983b8f621ee797fa4a6b7a2489c5478afa7d355cc4b4a3ca0');
INSERT INTO audit_log VALUES(24,'2026-12-01T07:00:00Z','2026-12-01T07:00:00Z','r.okafor','instrument.service-back','instrument','IC-02','pump seal replaced',1,'curvewarden 0.1.0','{"instrument_service_events":[{"audit_seq":24,"direction":"back","id":2,"instrument_id":1,"occurred_at":"2026-12-01T07:00:00Z","reason":"pump seal replaced"}]}','f7af39dc1e981ec983b8f621ee797fa4a6b7a2489c5478afa7d355cc4b4a3ca0','affa2c223576c2d14c9835a12aec41ca31cc4e6f9ddab5539b5aa3795cb5afb3');
INSERT INTO audit_log VALUES(25,'2026-12-01T07:00:00Z','2026-12-01T07:00:00Z','r.okafor','curve.retire','curve','2','superseded by revision',1,'curvewarden 0.1.0','{"curve_retirements":[{"audit_seq":25,"curve_id":2,"id":1,"occurred_at":"2026-12-01T07:00:00Z","reason":"superseded by revision","retired_by":"r.okafor"}]}','affa2c223576c2d14c9835a12aec41ca31cc4e6f9ddab5539b5aa3795cb5afb3','0525332eb207f4642d26f8445f66bd0980ab348e0fa334f773fa4b3d5c637c14');
INSERT INTO audit_log VALUES(26,'2026-12-01T07:00:00Z','2026-12-01T07:00:00Z','r.okafor','lot.withdraw','lot','CRM-AN-0419','supplier recall',1,'curvewarden 0.1.0','{"lot_withdrawals":[{"audit_seq":26,"id":1,"lot_id":1,"occurred_at":"2026-12-01T07:00:00Z","reason":"supplier recall"}]}','0525332eb207f4642d26f8445f66bd0980ab348e0fa334f773fa4b3d5c637c14','29eb4a116b6c7b5ceef60323ae5bf85228b9db4ed21c0e69532c767898c4e73f');
CREATE TABLE lab_settings (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  lab_name    TEXT    NOT NULL,
  time_zone   TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO lab_settings VALUES(1,'Millbrook Water Laboratory','Europe/Berlin',1);
CREATE TABLE instruments (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  code          TEXT    NOT NULL UNIQUE,
  name          TEXT,
  registered_at TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO instruments VALUES(1,'IC-02','Ion chromatograph, bay 2','2026-11-30T07:30:00Z',2);
CREATE TABLE instrument_service_events (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  instrument_id INTEGER NOT NULL REFERENCES instruments (id),
  direction     TEXT    NOT NULL CHECK (direction IN ('out', 'back')),
  reason        TEXT    NOT NULL,
  occurred_at   TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO instrument_service_events VALUES(1,1,'out','pump seal','2026-12-01T07:00:00Z',23);
INSERT INTO instrument_service_events VALUES(2,1,'back','pump seal replaced','2026-12-01T07:00:00Z',24);
CREATE TABLE methods (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  code          TEXT    NOT NULL UNIQUE,
  registered_at TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO methods VALUES(1,'ANION-IC','2026-11-30T07:30:00Z',3);
CREATE TABLE method_versions (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  method_id     INTEGER NOT NULL REFERENCES methods (id),
  version       INTEGER NOT NULL CHECK (version >= 1),
  effective_at  TEXT    NOT NULL,               -- in force from this instant
  title         TEXT    NOT NULL,
  unit          TEXT    NOT NULL,
  definition    TEXT    NOT NULL,               -- canonical JSON of the parsed file
  source_name   TEXT    NOT NULL,               -- file name as given
  source_text   TEXT    NOT NULL,               -- the file, byte for byte
  source_sha256 TEXT    NOT NULL CHECK (length(source_sha256) = 64),
  reason        TEXT,                           -- required from version 2 on
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (method_id, version)
) STRICT;
INSERT INTO method_versions VALUES(1,1,1,'2026-11-30T07:30:00Z','Nitrate and sulfate in drinking water by ion chromatography','mg/L','{"analytes":["nitrate","sulfate"],"calibration":{"max_error_pct":15.0,"max_error_pct_lowest":20.0,"max_rf_rsd_pct":null,"min_levels":5,"min_levels_within":0.75,"min_r2":0.995,"model":"linear","review_required":true,"valid_for":"7 days","weighting":"1/x"},"check":{"blank_limit":null,"check_every":"12 hours","samples_per_check":10,"tolerance_pct":10.0,"trend_rules":["1-3s","2-2s","R-4s"]},"code":"ANION-IC","internal_standard":null,"title":"Nitrate and sulfate in drinking water by ion chromatography","unit":"mg/L"}','anion-ic.toml',replace('# Demo method of the fictional Millbrook Water Laboratory: anions by ion chromatography.\n# The limits are illustrative; your SOP and method validation decide the real ones.\ncode = "ANION-IC"\ntitle = "Nitrate and sulfate in drinking water by ion chromatography"\nunit = "mg/L"\nanalytes = ["nitrate", "sulfate"]\n\n[calibration]\nmodel = "linear"\nweighting = "1/x"\nmin_levels = 5\nmin_r2 = 0.995\nmax_error_pct = 15.0\nmax_error_pct_lowest = 20.0\nmin_levels_within = 0.75\nvalid_for = "7 days"\nreview_required = true\n\n[check]\ntolerance_pct = 10.0\nsamples_per_check = 10\ncheck_every = "12 hours"\ntrend_rules = ["1-3s", "2-2s", "R-4s"]\n','\n',char(10)),'2f1892c14888d875b5bdd71ca17ab857713ccbea6c496b6acc381d3921057c0e',NULL,3);
INSERT INTO method_versions VALUES(2,1,2,'2026-12-01T07:00:00Z','Nitrate and sulfate in drinking water by ion chromatography (new guard column)','mg/L','{"analytes":["nitrate","sulfate"],"calibration":{"max_error_pct":15.0,"max_error_pct_lowest":20.0,"max_rf_rsd_pct":null,"min_levels":5,"min_levels_within":0.75,"min_r2":0.995,"model":"linear","review_required":true,"valid_for":"7 days","weighting":"1/x"},"check":{"blank_limit":null,"check_every":"12 hours","samples_per_check":10,"tolerance_pct":10.0,"trend_rules":["1-3s","2-2s","R-4s"]},"code":"ANION-IC","internal_standard":null,"title":"Nitrate and sulfate in drinking water by ion chromatography (new guard column)","unit":"mg/L"}','anion-ic-v2.toml',replace('# Demo method of the fictional Millbrook Water Laboratory: anions by ion chromatography.\n# The limits are illustrative; your SOP and method validation decide the real ones.\ncode = "ANION-IC"\ntitle = "Nitrate and sulfate in drinking water by ion chromatography (new guard column)"\nunit = "mg/L"\nanalytes = ["nitrate", "sulfate"]\n\n[calibration]\nmodel = "linear"\nweighting = "1/x"\nmin_levels = 5\nmin_r2 = 0.995\nmax_error_pct = 15.0\nmax_error_pct_lowest = 20.0\nmin_levels_within = 0.75\nvalid_for = "7 days"\nreview_required = true\n\n[check]\ntolerance_pct = 10.0\nsamples_per_check = 10\ncheck_every = "12 hours"\ntrend_rules = ["1-3s", "2-2s", "R-4s"]\n','\n',char(10)),'cbc32d4a16c50670b8a6ec1a97d872f602da0ebc31e351c418321621aa9c1b19','guard column changed',21);
CREATE TABLE lots (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  code          TEXT    NOT NULL UNIQUE,
  material      TEXT    NOT NULL,
  expires_on    TEXT    NOT NULL,               -- certificate expiry, YYYY-MM-DD (lab-local day)
  opened_on     TEXT,
  in_use_days   INTEGER CHECK (in_use_days IS NULL OR in_use_days > 0),
  certificate   TEXT,
  registered_at TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO lots VALUES(1,'CRM-AN-0419','Anion multi-element standard 1000 mg/L','2027-06-30','2026-11-02',60,'CoA 0419-B','2026-11-30T07:30:00Z',4);
INSERT INTO lots VALUES(2,'CRM-AN-0388','Anion standard, second source','2026-12-03',NULL,NULL,NULL,'2026-11-30T07:30:00Z',5);
CREATE TABLE lot_values (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  lot_id      INTEGER NOT NULL REFERENCES lots (id),
  analyte     TEXT    NOT NULL,
  value       REAL    NOT NULL,
  uncertainty REAL    CHECK (uncertainty IS NULL OR uncertainty >= 0),
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (lot_id, analyte)
) STRICT;
INSERT INTO lot_values VALUES(1,1,'nitrate',1000.0,4.0,4);
INSERT INTO lot_values VALUES(2,1,'sulfate',1000.0,5.0,4);
INSERT INTO lot_values VALUES(3,2,'nitrate',500.0,3.0,5);
INSERT INTO lot_values VALUES(4,2,'sulfate',500.0,3.0,5);
CREATE TABLE lot_withdrawals (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  lot_id      INTEGER NOT NULL UNIQUE REFERENCES lots (id),
  reason      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO lot_withdrawals VALUES(1,1,'supplier recall','2026-12-01T07:00:00Z',26);
CREATE TABLE calibrations (
  id                INTEGER PRIMARY KEY AUTOINCREMENT,
  method_version_id INTEGER NOT NULL REFERENCES method_versions (id),
  instrument_id     INTEGER NOT NULL REFERENCES instruments (id),
  acquired_at       TEXT    NOT NULL,
  analyst           TEXT    NOT NULL,
  note              TEXT,
  points_file       TEXT    NOT NULL,
  points_sha256     TEXT    NOT NULL CHECK (length(points_sha256) = 64),
  audit_seq         INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO calibrations VALUES(1,1,1,'2026-11-30T08:15:00Z','r.okafor','Monday calibration','ical-2026-11-30.csv','ee3eca062e2c672b959f1ee57c3871199411f62ae4f00407362dc98bc0a458eb',6);
INSERT INTO calibrations VALUES(2,1,1,'2026-11-30T08:15:00Z','r.okafor',NULL,'ical-poor.csv','5edf2a15c46ac1964b760dbf377e304fe758c6c18f94f346507f90955688ac60',9);
CREATE TABLE calibration_lots (
  id             INTEGER PRIMARY KEY AUTOINCREMENT,
  calibration_id INTEGER NOT NULL REFERENCES calibrations (id),
  lot_id         INTEGER NOT NULL REFERENCES lots (id),
  audit_seq      INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (calibration_id, lot_id)
) STRICT;
INSERT INTO calibration_lots VALUES(1,1,1,6);
INSERT INTO calibration_lots VALUES(2,2,1,9);
CREATE TABLE curves (
  id              INTEGER PRIMARY KEY AUTOINCREMENT,
  calibration_id  INTEGER NOT NULL REFERENCES calibrations (id),
  -- copies of the calibration's keys, so that lookups by group and by expiry need no join
  method_id       INTEGER NOT NULL REFERENCES methods (id),
  instrument_id   INTEGER NOT NULL REFERENCES instruments (id),
  acquired_at     TEXT    NOT NULL,
  analyte         TEXT    NOT NULL,
  model           TEXT    NOT NULL CHECK (model IN ('linear', 'linear-through-origin',
                                                     'quadratic', 'mean-response-factor')),
  weighting       TEXT    NOT NULL CHECK (weighting IN ('none', '1/x', '1/x^2', '1/y', '1/y^2')),
  intercept       REAL    NOT NULL,
  slope           REAL    NOT NULL,
  quadratic       REAL    NOT NULL,
  se_intercept    REAL    NOT NULL,
  se_slope        REAL    NOT NULL,
  se_quadratic    REAL    NOT NULL,
  r2              REAL    NOT NULL,
  residual_sd     REAL    NOT NULL,
  dof             INTEGER NOT NULL,
  n_points        INTEGER NOT NULL,
  n_levels        INTEGER NOT NULL,
  range_low       REAL    NOT NULL,
  range_high      REAL    NOT NULL,
  lod             REAL    NOT NULL,
  loq             REAL    NOT NULL,
  rf_rsd_pct      REAL    NOT NULL,
  verdict         TEXT    NOT NULL CHECK (verdict IN ('accepted', 'rejected')),
  failed_criteria TEXT    NOT NULL,             -- JSON array of criterion tokens
  statistics      TEXT    NOT NULL,             -- JSON: the full fit (covariance, weights, Mandel, ...)
  acceptance      TEXT    NOT NULL,             -- JSON: every criterion with value and limit
  expires_at      TEXT    NOT NULL,             -- earliest of acquired + valid_for and lot expiries
  audit_seq       INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO curves VALUES(1,1,1,1,'2026-11-30T08:15:00Z','nitrate','linear','1/x',0.00045242042440313268159,0.10009164456233421436,0.0,0.00097619894426680890297,0.00018706710501429987141,0.0,0.99996507117060595692,0.0031775009879494594232,10,12,6,0.5,50.0,0.1047615243618360975,0.31745916473283669612,0.91825876654087712491,'accepted','[]','{"covariance":[[9.529643787876323e-07,-6.248946746148409e-08,0.0],[-6.248946746148409e-08,3.499410177843109e-08,0.0],[0.0,0.0,0.0]],"dof":10,"intercept":0.0004524204244031327,"lod":0.1047615243618361,"loq":0.3174591647328367,"mandel":{"dof_quadratic":9,"ds2":3.3467120049275557e-07,"f_critical_99":10.561431047395386,"linear_adequate":true,"s_y1":0.0031775009879494594,"s_y2":0.0033438243920481422,"test_value":0.029931702404218136},"model":"linear","n_levels":6,"n_points":12,"quadratic":0.0,"r2":0.999965071170606,"r2_definition":"weighted, centred: 1 - sum(w*e^2)/sum(w*(y - ybar_w)^2)","range_high":50.0,"range_low":0.5,"residual_sd":0.0031775009879494594,"rf_mean":0.10034499999999998,"rf_rsd_pct":0.9182587665408771,"rf_sd":0.0009214267592854429,"se_intercept":0.0009761989442668089,"se_quadratic":0.0,"se_slope":0.00018706710501429987,"slope":0.10009164456233421,"sse":0.0001009651252841979,"sum_raw_weights":6.719999999999999,"sum_x2_w":326.78571428571433,"sxx_w":288.52040816326536,"weighting":"1/x","weights_normalisation":"weights scaled to sum to the number of fitted points","xbar_w":1.7857142857142858,"ybar_w":0.17918750000000006}','{"accepted":true,"failures":[],"warnings":[]}','2026-12-07T08:15:00Z',7);
INSERT INTO curves VALUES(2,1,1,1,'2026-11-30T08:15:00Z','sulfate','linear','1/x',8.7650108565540119087e-05,0.029843319891877523319,0.0,0.00047414342033001314951,4.0156266537617456985e-05,0.0,0.99999275782134389167,0.0010785624608690344821,4,6,6,1.0,100.0,0.11926475116585601166,0.36140833686623036191,0.48232067956893087679,'accepted','[]','{"covariance":[[2.2481198304224352e-07,-7.062156535358437e-09,0.0],[-7.062156535358437e-09,1.6125257422401758e-09,0.0],[0.0,0.0,0.0]],"dof":4,"intercept":8.765010856554012e-05,"lod":0.11926475116585601,"loq":0.36140833686623036,"mandel":{"dof_quadratic":3,"ds2":4.818483464140001e-07,"f_critical_99":34.11622156452979,"linear_adequate":true,"s_y1":0.0010785624608690345,"s_y2":0.0011791719667588027,"test_value":0.3465421625295041},"model":"linear","n_levels":6,"n_points":6,"quadratic":0.0,"r2":0.9999927578213439,"r2_definition":"weighted, centred: 1 - sum(w*e^2)/sum(w*(y - ybar_w)^2)","range_high":100.0,"range_low":1.0,"residual_sd":0.0010785624608690345,"rf_mean":0.02986333333333333,"rf_rsd_pct":0.4823206795689309,"rf_sd":0.00014403703227526836,"se_intercept":0.00047414342033001315,"se_quadratic":0.0,"se_slope":4.015626653761746e-05,"slope":0.029843319891877523,"sse":4.653187927983469e-06,"sum_raw_weights":1.37,"sum_x2_w":836.4963503649633,"sxx_w":721.4129681922318,"weighting":"1/x","weights_normalisation":"weights scaled to sum to the number of fitted points","xbar_w":4.37956204379562,"ybar_w":0.1307883211678832}','{"accepted":true,"failures":[],"warnings":[]}','2026-12-07T08:15:00Z',8);
INSERT INTO curves VALUES(3,2,1,1,'2026-11-30T08:15:00Z','nitrate','linear','1/x',0.014585175552665780029,0.098767230169050743149,0.0,0.0071335336504111156522,0.0031902132324202951522,0.0,0.99791772345779183872,0.011989027046249552121,2,4,4,0.5,10.0,0.40057607351047347377,1.2138668894256772201,17.569399797680617325,'rejected','["too-few-levels"]','{"covariance":[[5.0887302341547735e-05,-1.2336315719163087e-05,0.0],[-1.2336315719163087e-05,1.0177460468309547e-05,0.0],[0.0,0.0,0.0]],"dof":2,"intercept":0.01458517555266578,"lod":0.4005760735104735,"loq":1.2138668894256772,"mandel":{"dof_quadratic":1,"ds2":8.172010618283664e-05,"f_critical_99":4052.1806954768217,"linear_adequate":true,"s_y1":0.011989027046249552,"s_y2":0.01434410794886074,"test_value":0.397174934344745},"model":"linear","n_levels":4,"n_points":4,"quadratic":0.0,"r2":0.9979177234577918,"r2_definition":"weighted, centred: 1 - sum(w*e^2)/sum(w*(y - ybar_w)^2)","range_high":10.0,"range_low":0.5,"residual_sd":0.011989027046249552,"rf_mean":0.11080000000000001,"rf_rsd_pct":17.569399797680617,"rf_sd":0.019466894975830127,"se_intercept":0.007133533650411116,"se_quadratic":0.0,"se_slope":0.003190213232420295,"slope":0.09876723016905074,"sse":0.0002874735390314065,"sum_raw_weights":3.3000000000000003,"sum_x2_w":20.0,"sxx_w":14.123048668503216,"weighting":"1/x","weights_normalisation":"weights scaled to sum to the number of fitted points","xbar_w":1.212121212121212,"ybar_w":0.1343030303030303}','{"accepted":false,"failures":[{"criterion":"too-few-levels","detail":"4 distinct levels fitted, at least 5 required","level":null,"limit":5.0,"value":4.0}],"warnings":[]}','2026-12-07T08:15:00Z',10);
CREATE TABLE curve_points (
  id              INTEGER PRIMARY KEY AUTOINCREMENT,
  curve_id        INTEGER NOT NULL REFERENCES curves (id),
  source_line     INTEGER NOT NULL,
  level           TEXT    NOT NULL,
  replicate       INTEGER NOT NULL,
  nominal         REAL    NOT NULL,
  response        REAL    NOT NULL,
  is_response     REAL,
  y               REAL    NOT NULL,             -- the fitted response (ratio with an internal standard)
  back_calculated REAL,
  error_pct       REAL,
  within_limits   INTEGER NOT NULL CHECK (within_limits IN (0, 1)),
  excluded        INTEGER NOT NULL CHECK (excluded IN (0, 1)),
  exclude_reason  TEXT,
  audit_seq       INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (curve_id, level, replicate)
) STRICT;
INSERT INTO curve_points VALUES(1,1,2,'1',1,0.5,0.051200000000000002453,NULL,0.051200000000000002453,0.50701114760875698461,1.4022295217513969234,1,0,NULL,7);
INSERT INTO curve_points VALUES(2,1,3,'1',2,0.5,0.049799999999999997046,NULL,0.049799999999999997046,0.49302396610003346166,-1.3952067799933076663,1,0,NULL,7);
INSERT INTO curve_points VALUES(3,1,4,'2',1,1.0,0.10100000000000000643,NULL,0.10100000000000000643,1.0045551755619193112,0.45551755619193112778,1,0,NULL,7);
INSERT INTO curve_points VALUES(4,1,5,'2',2,1.0,0.099500000000000005107,NULL,0.099500000000000005107,0.98956890965971566753,-1.0431090340284332462,1,0,NULL,7);
INSERT INTO curve_points VALUES(5,1,6,'3',1,5.0,0.50500000000000000444,NULL,0.50500000000000000444,5.0408561252221124604,0.81712250444224920897,1,0,NULL,7);
INSERT INTO curve_points VALUES(6,1,7,'3',2,5.0,0.49869999999999997664,NULL,0.49869999999999997664,4.9779138084328558022,-0.44172383134288395467,1,0,NULL,7);
INSERT INTO curve_points VALUES(7,1,8,'4',1,10.0,1.0120000000000000106,NULL,1.0120000000000000106,10.106214000166955813,1.0621400016695581314,1,0,NULL,7);
INSERT INTO curve_points VALUES(8,1,9,'4',2,10.0,0.99499999999999999555,NULL,0.99499999999999999555,9.9363696532753156276,-0.63630346724684372361,1,0,NULL,7);
INSERT INTO curve_points VALUES(9,1,10,'5',1,25.0,2.5099999999999997868,NULL,2.5099999999999997868,25.072498214501035107,0.28999285800414043023,1,0,NULL,7);
INSERT INTO curve_points VALUES(10,1,11,'5',2,25.0,2.4900000000000002131,NULL,2.4900000000000002131,24.872681335804990964,-0.50927465678003613902,1,0,NULL,7);
INSERT INTO curve_points VALUES(11,1,12,'6',1,50.0,4.9800000000000004263,NULL,4.9800000000000004263,49.749882733463110183,-0.50023453307377963028,1,0,NULL,7);
INSERT INTO curve_points VALUES(12,1,13,'6',2,50.0,5.0300000000000002486,NULL,5.0300000000000002486,50.249424930203225869,0.49884986040645173943,1,0,NULL,7);
INSERT INTO curve_points VALUES(13,2,14,'1',1,1.0,0.030099999999999998284,NULL,0.030099999999999998284,1.0056639140742160698,0.56639140742160698493,1,0,NULL,8);
INSERT INTO curve_points VALUES(14,2,15,'2',1,5.0,0.14879999999999998783,NULL,0.14879999999999998783,4.9831034358851473697,-0.33793128229705260423,1,0,NULL,8);
INSERT INTO curve_points VALUES(15,2,16,'3',1,10.0,0.29870000000000002104,NULL,0.29870000000000002104,10.006003051044867647,0.060030510448676466239,1,0,NULL,8);
INSERT INTO curve_points VALUES(16,2,17,'4',1,25.0,0.74199999999999999289,NULL,0.74199999999999999289,24.860248544042217843,-0.55900582383112862316,1,0,NULL,8);
INSERT INTO curve_points VALUES(17,2,18,'4',2,25.0,0.20999999999999999222,NULL,0.20999999999999999222,7.033813618992383887,-71.864745524030468003,0,1,'air bubble in the loop (injection log 2026-11-30)',8);
INSERT INTO curve_points VALUES(18,2,19,'5',1,50.0,1.4959999999999999964,NULL,1.4959999999999999964,50.125534133304583406,0.25106826660916681248,1,0,NULL,8);
INSERT INTO curve_points VALUES(19,2,20,'6',1,100.0,2.9849999999999998756,NULL,2.9849999999999998756,100.01944692164896366,0.019446921648963666484,1,0,NULL,8);
INSERT INTO curve_points VALUES(20,3,2,'1',1,0.5,0.070000000000000006661,NULL,0.070000000000000006661,0.56106488308405322307,12.212976616810644614,1,0,NULL,10);
INSERT INTO curve_points VALUES(21,3,3,'2',1,1.0,0.10100000000000000643,NULL,0.10100000000000000643,0.87493416894880982059,-12.506583105119018384,1,0,NULL,10);
INSERT INTO curve_points VALUES(22,3,4,'3',1,5.0,0.50500000000000000444,NULL,0.50500000000000000444,4.9653597008637015974,-0.69280598272596805031,1,0,NULL,10);
INSERT INTO curve_points VALUES(23,3,5,'4',1,10.0,1.0120000000000000106,NULL,1.0120000000000000106,10.098641247103431695,0.98641247103431695109,1,0,NULL,10);
CREATE TABLE curve_reviews (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  curve_id    INTEGER NOT NULL REFERENCES curves (id),
  decision    TEXT    NOT NULL CHECK (decision IN ('approve', 'reject')),
  reviewer    TEXT    NOT NULL,
  reason      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO curve_reviews VALUES(1,1,'approve','j.lindqvist','fit checked','2026-11-30T08:15:00Z',12);
INSERT INTO curve_reviews VALUES(2,2,'approve','j.lindqvist','fit checked','2026-11-30T08:15:00Z',13);
CREATE TABLE curve_retirements (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  curve_id    INTEGER NOT NULL REFERENCES curves (id),
  retired_by  TEXT    NOT NULL,
  reason      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO curve_retirements VALUES(1,2,'r.okafor','superseded by revision','2026-12-01T07:00:00Z',25);
CREATE TABLE refusals (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  action      TEXT    NOT NULL,                 -- what was attempted, e.g. 'curve.review'
  entity_kind TEXT    NOT NULL,
  entity_id   TEXT    NOT NULL,
  actor       TEXT    NOT NULL,
  reasons     TEXT    NOT NULL,                 -- JSON array of reason tokens
  message     TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO refusals VALUES(1,'curve.review','curve','1','r.okafor','["self-review"]','curve 1 was logged by r.okafor; a second person must review it (the reviewer cannot be the analyst)','2026-11-30T08:15:00Z',11);
INSERT INTO refusals VALUES(2,'check.log','curve','3','r.okafor','["rejected"]','curve 3 is rejected (failed acceptance: 4 distinct levels fitted, at least 5 required); checks are not recorded against it','2026-12-01T07:00:00Z',22);
CREATE TABLE checks (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  curve_id      INTEGER NOT NULL REFERENCES curves (id),
  kind          TEXT    NOT NULL CHECK (kind IN ('check', 'blank')),
  nominal       REAL    NOT NULL,
  response      REAL    NOT NULL,
  is_response   REAL,
  measured      REAL,                           -- NULL when the response has no solution
  recovery_pct  REAL,                           -- NULL for blanks
  limit_low     REAL,                           -- recovery limits (check) ...
  limit_high    REAL,                           -- ... or the blank limit (blank, in limit_high)
  passed        INTEGER NOT NULL CHECK (passed IN (0, 1)),
  analyst       TEXT    NOT NULL,
  occurred_at   TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO checks VALUES(1,1,'check',10.0,1.0029999999999998916,NULL,10.016296404753733284,100.16296404753732929,90.0,110.0,1,'r.okafor','2026-11-30T09:00:00Z',14);
INSERT INTO checks VALUES(2,1,'check',10.0,0.86099999999999998756,NULL,8.5975965660117843469,85.975965660117850573,90.0,110.0,0,'r.okafor','2026-11-30T13:00:00Z',19);
CREATE TABLE results (
  id                INTEGER PRIMARY KEY AUTOINCREMENT,
  sample            TEXT    NOT NULL,
  analyte           TEXT    NOT NULL,
  status            TEXT    NOT NULL CHECK (status IN ('reported', 'refused')),
  curve_id          INTEGER REFERENCES curves (id),
  method_id         INTEGER REFERENCES methods (id),
  instrument_id     INTEGER REFERENCES instruments (id),
  response          REAL    NOT NULL,
  is_response       REAL,
  replicates        INTEGER NOT NULL CHECK (replicates >= 1),
  dilution          REAL    NOT NULL CHECK (dilution > 0),
  x0                REAL,                       -- instrument-level concentration
  sd_x0             REAL,
  concentration     REAL,                       -- x0 times the dilution factor
  ci_low            REAL,
  ci_high           REAL,
  flags             TEXT    NOT NULL,           -- JSON array
  reasons           TEXT    NOT NULL,           -- JSON array of reason tokens
  reason_details    TEXT    NOT NULL,           -- JSON array of {reason, since, message}
  analyst           TEXT    NOT NULL,
  occurred_at       TEXT    NOT NULL,
  audit_seq         INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
INSERT INTO results VALUES(1,'MW-1187','nitrate','reported',1,1,1,0.74199999999999999289,NULL,1,1.0,7.4086861377702932784,0.066148798051834420408,7.4086861377702932784,7.2612974308188071859,7.556074844721779371,'[]','[]','[]','r.okafor','2026-11-30T09:00:00Z',15);
INSERT INTO results VALUES(2,'MW-1188','nitrate','reported',1,1,1,0.030999999999999999777,NULL,1,2.0,0.30519610012574732715,0.016244491356408579524,0.61039220025149465431,0.53800223560755633389,0.68278216489543297473,'["below-range"]','[]','[]','r.okafor','2026-11-30T09:00:00Z',16);
INSERT INTO results VALUES(3,'MW-1189','nitrate','refused',1,1,1,6.9000000000000003552,NULL,1,1.0,68.932303088283816807,0.23395743342503033668,NULL,NULL,NULL,'[]','["above-range"]','[{"message":"response 6.9 gives about 68.9 mg/L, above the highest calibrator (50 mg/L): dilute and re-run (e.g. a 2-fold dilution)","reason":"above-range","since":null}]','r.okafor','2026-11-30T09:00:00Z',17);
INSERT INTO results VALUES(4,'MW-1190','nitrate','reported',1,1,1,1.5200000000000000177,NULL,1,1.0,15.181562719046603149,0.096326603245896064153,15.181562719046603149,14.966933671874555145,15.396191766218651153,'[]','[]','[]','r.okafor','2026-11-30T13:00:00Z',18);
INSERT INTO results VALUES(5,'MW-1191','nitrate','refused',NULL,1,1,0.5,NULL,1,1.0,NULL,NULL,NULL,NULL,NULL,'[]','["no-active-curve","check-failed"]','[{"message":"no active curve for method ANION-IC, instrument IC-02, analyte nitrate at 2026-11-30 14:00 +01:00; the latest accepted curve, 1, is stale","reason":"no-active-curve","since":null},{"message":"check 2 at 2026-11-30 14:00 +01:00: measured 8.598 mg/L against nominal 10 (recovery 86.0 %, allowed 90–110 %)","reason":"check-failed","since":"2026-11-30T13:00:00Z"}]','r.okafor','2026-11-30T13:00:00Z',20);
DELETE FROM sqlite_sequence;
INSERT INTO sqlite_sequence VALUES('lab_settings',1);
INSERT INTO sqlite_sequence VALUES('instruments',1);
INSERT INTO sqlite_sequence VALUES('methods',1);
INSERT INTO sqlite_sequence VALUES('method_versions',2);
INSERT INTO sqlite_sequence VALUES('lots',2);
INSERT INTO sqlite_sequence VALUES('lot_values',4);
INSERT INTO sqlite_sequence VALUES('calibrations',2);
INSERT INTO sqlite_sequence VALUES('calibration_lots',2);
INSERT INTO sqlite_sequence VALUES('curves',3);
INSERT INTO sqlite_sequence VALUES('curve_points',23);
INSERT INTO sqlite_sequence VALUES('refusals',2);
INSERT INTO sqlite_sequence VALUES('curve_reviews',2);
INSERT INTO sqlite_sequence VALUES('checks',2);
INSERT INTO sqlite_sequence VALUES('results',5);
INSERT INTO sqlite_sequence VALUES('instrument_service_events',2);
INSERT INTO sqlite_sequence VALUES('curve_retirements',1);
INSERT INTO sqlite_sequence VALUES('lot_withdrawals',1);
CREATE INDEX audit_log_by_entity ON audit_log (entity_kind, entity_id, seq);
CREATE INDEX audit_log_by_recorded ON audit_log (recorded_at);
CREATE INDEX instrument_service_events_by_instrument
  ON instrument_service_events (instrument_id, occurred_at);
CREATE INDEX calibration_lots_by_lot ON calibration_lots (lot_id);
CREATE INDEX curves_by_expiry ON curves (expires_at);
CREATE INDEX curves_by_group ON curves (method_id, instrument_id, analyte, acquired_at);
CREATE INDEX curves_by_instrument ON curves (instrument_id, expires_at);
CREATE INDEX curves_by_calibration ON curves (calibration_id);
CREATE INDEX curve_reviews_by_curve ON curve_reviews (curve_id, occurred_at);
CREATE INDEX curve_retirements_by_curve ON curve_retirements (curve_id, occurred_at);
CREATE INDEX checks_by_curve ON checks (curve_id, occurred_at);
CREATE INDEX results_by_curve ON results (curve_id, occurred_at);
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
COMMIT;
PRAGMA application_id = 1129796164;
PRAGMA user_version = 4;
