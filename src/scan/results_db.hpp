#pragma once
// The results database of a scan (SQLite, one file DIR/scan.db), which is also
// its checkpoint.
//
//   plan(key TEXT PRIMARY KEY, value TEXT)   format, header (the scan's parameters
//        as JSON), shard "i/k", job_count, merged_from, created_by (provenance).
//        Job number ↔ pair is the function scan_job(spec, job) of the header.
//   pairs(job INTEGER PRIMARY KEY, t, F, G, A, B, A2, B2, verdict, Q, prime,
//        modulus, r1, r2, limit1, limit2, limit1_ball, limit2_ball, k, constant,
//        contains_integer, prec, verified, verify_failure, reason,
//        proportional_subclasses)  one row per finished job; the *_ball columns
//        hold the limit intervals exactly (ball_io.hpp JSON: mid and radius as
//        m*2^e), limit1/limit2 the same rounded outward for display.
//   indices by t, by verdict and by separating prime.
//
// Certificates are not stored: every row is re-derivable by
// `circlet certify F G --ap A,B --ap2 A2,B2 --prec P` (P = the row's prec), and
// --verify re-checks each certificate before its row is written.
//
// A row is the same JSON object run_scan_job returns: keys are column names,
// absent keys are NULL.
#include <functional>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>

#include "scan/scan_plan.hpp"
#include "scan/sqlite.hpp"

namespace circlet {

inline constexpr const char* kScanDbFormat = "circlet-scan-db/1";

/// The columns of the pairs table, in order (also the columns of scan.csv).
struct ScanColumn {
  const char* name;
  char type;  // 'i' integer, 't' text, 'b' boolean (0/1), 'j' JSON text
};
const std::vector<ScanColumn>& scan_columns();

/// The scan parameters a header describes (UserError when malformed).
ScanSpec scan_spec_from_header(const nlohmann::json& header);

class ResultsDb {
 public:
  enum class Mode { Create, Resume, Read };
  /// Create: `path` must not exist (UserError otherwise); the plan is written.
  /// Resume: `path` must exist and hold the plan of `header`/`shard` (UserError naming
  ///   the difference, or saying what is missing); a damaged file is refused, never changed.
  /// Read: any scan database (UserError when it is not one); header/shard are ignored.
  ResultsDb(const std::string& path, Mode mode, const nlohmann::json& header = {}, const std::string& shard = "");

  const nlohmann::json& header() const { return header_; }
  const std::string& shard() const { return shard_; }
  std::string plan_value(const std::string& key);
  void set_plan_value(const std::string& key, const std::string& value);
  SqliteDb& db() { return db_; }

  /// Inserts one row; returns false (nothing written) when its job is already there.
  bool insert(const nlohmann::json& row);
  /// Replaces the row of row["job"].
  void replace(const nlohmann::json& row);
  void erase(long job);
  long count();
  /// Calls f(row, problem) for every row in job order, `problem` empty when the row
  /// has the column types of the schema (else a description; the row is then partial).
  void for_each_row(const std::function<void(const nlohmann::json&, const std::string&)>& f,
                    const std::string& where = "");

 private:
  SqliteDb db_;
  nlohmann::json header_;
  std::string shard_;
  std::unique_ptr<SqliteStatement> insert_, replace_;
  void bind_row(SqliteStatement& s, const nlohmann::json& row);
};

/// Checks a row against the plan: job in range and owned by the shard, the pair
/// fields equal scan_job(spec, job), a verdict of the right kind with its data.
/// Returns an empty string when the row is consistent, else what is wrong.
std::string check_row_against_plan(const nlohmann::json& row, const ScanSpec& spec, const ShardSpec& shard);

/// Does this row claim something that must be recomputed before it is trusted
/// (CONSTANT, PROPORTIONAL, or an integer constant)?
bool row_needs_recomputation(const nlohmann::json& row);

}  // namespace circlet
