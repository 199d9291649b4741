import type { Migration } from "kysely";
import * as m0001 from "./20261201_0001_create_core_tables";
import * as m0002 from "./20261201_0002_create_workshop_tables";
import * as m0003 from "./20261201_0003_create_billing_tables";
import * as m0004 from "./20261201_0004_create_uploads_and_mail_tables";
import * as m0005 from "./20261201_0005_create_card_tables";
import * as m0100 from "./20261202_0100_add_job_matching_mode";
import * as m0105 from "./20261202_0105_add_oil_allowance_per_rod";
import * as m0110 from "./20261202_0110_add_job_entered_lengths";
import * as m0120 from "./20261202_0120_add_confirmed_outlier_to_part_weights";
import * as m0121 from "./20261202_0121_add_outlier_percent_to_shop_settings";
import * as m0122 from "./20261202_0122_add_job_fingerprint_to_balance_cards";
import * as m0150 from "./20261202_0150_seed_job_number_sequences";
import * as m0160 from "./20261202_0160_create_build_requests";
import * as m0161 from "./20261202_0161_create_build_sections";
import * as m0162 from "./20261202_0162_create_build_settings";
import * as m0163 from "./20261202_0163_create_build_cards";
import * as m0180 from "./20261202_0180_create_counter_settings";
import * as m0190 from "./20261202_0190_create_job_search_index";
import * as m0191 from "./20261202_0191_add_sender_to_mail_log";
import * as m0200 from "./20261202_0200_add_session_version_to_users";
import * as m0201 from "./20261202_0201_create_ended_sessions";
import * as m0202 from "./20261202_0202_create_rate_limits";
import * as m0250 from "./20261202_0250_add_payment_reconciliation";
import * as m0260 from "./20261202_0260_add_price_item_unit";
import * as m0280 from "./20261202_0280_add_payment_session_close_failure";

// A static map of the same files, for tests and for code running inside Next (which cannot read
// the folder at run time). `scripts/migrate.ts` reads the folder itself. Add each new file here.
export const migrations: Record<string, Migration> = {
  "20261201_0001_create_core_tables": m0001,
  "20261201_0002_create_workshop_tables": m0002,
  "20261201_0003_create_billing_tables": m0003,
  "20261201_0004_create_uploads_and_mail_tables": m0004,
  "20261201_0005_create_card_tables": m0005,
  "20261202_0100_add_job_matching_mode": m0100,
  "20261202_0105_add_oil_allowance_per_rod": m0105,
  "20261202_0110_add_job_entered_lengths": m0110,
  "20261202_0120_add_confirmed_outlier_to_part_weights": m0120,
  "20261202_0121_add_outlier_percent_to_shop_settings": m0121,
  "20261202_0122_add_job_fingerprint_to_balance_cards": m0122,
  "20261202_0150_seed_job_number_sequences": m0150,
  "20261202_0160_create_build_requests": m0160,
  "20261202_0161_create_build_sections": m0161,
  "20261202_0162_create_build_settings": m0162,
  "20261202_0163_create_build_cards": m0163,
  "20261202_0180_create_counter_settings": m0180,
  "20261202_0190_create_job_search_index": m0190,
  "20261202_0191_add_sender_to_mail_log": m0191,
  "20261202_0200_add_session_version_to_users": m0200,
  "20261202_0201_create_ended_sessions": m0201,
  "20261202_0202_create_rate_limits": m0202,
  "20261202_0250_add_payment_reconciliation": m0250,
  "20261202_0260_add_price_item_unit": m0260,
  "20261202_0280_add_payment_session_close_failure": m0280,
};
