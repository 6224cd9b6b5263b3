#pragma once
// What a scan directory holds besides its results database (results_db.hpp),
// written atomically from the database at the end of a run:
//   summary.txt   a short human summary: counts per t and verdict, by Q and by
//                 separating prime, every CONSTANT pair and its constant, candidates
//   summary.json  the same as JSON, with the header and provenance
//   scan.csv      one row per job, streamed from the database (omitted with --no-csv)
// and the joining of shard databases (`circlet scan-merge`). Memory is bounded
// independently of the number of jobs: the summary is made by SQL aggregates,
// and the listed pairs (CONSTANT, proportional) are capped at kSummaryListCap.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "scan/results_db.hpp"
#include "scan/scan_job.hpp"

namespace circlet {

inline constexpr long kSummaryListCap = 1000;

/// The summary of the rows in `db`; `ctx` (may be null) provides series for the
/// exact-count comparison of CONSTANT candidates (an integer constant).
nlohmann::json scan_summary(ResultsDb& db, ScanContext* ctx);

/// The human summary text.
std::string scan_summary_text(const nlohmann::json& header, const std::string& shard, const nlohmann::json& summary);

/// Writes summary.txt, summary.json and (csv) scan.csv into `dir` from `db`.
void write_scan_outputs(const std::string& dir, ResultsDb& db, ScanContext* ctx, bool csv = true);

/// Joins shard databases (directories holding scan.db, or database files) of one
/// scan into out_dir/scan.db plus the exports. UserError (exit 2) when an input
/// is not a scan database, headers differ, a shard is missing or repeated, a row
/// is malformed, disagrees with the plan or (for CONSTANT/candidate claims) with
/// its recomputation, a job is missing or duplicated, or the output is an input.
void merge_scan_databases(const std::vector<std::string>& inputs, const std::string& out_dir, bool csv = true);

/// The CSV columns of scan.csv.
std::string scan_csv_header();

/// "c6(2n+1) vs sc11(3n+0)".
std::string scan_pair_text(const nlohmann::json& row);

}  // namespace circlet
