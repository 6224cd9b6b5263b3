#pragma once
// The outputs of a scan directory, written atomically at the end of a run
// (the checkpoint is the only file written during the run):
//   scan.csv     one row per job (provenance comment first)
//   scan.json    header, shard, summary and rows
//   summary.txt  a short human summary: counts per verdict, candidates
// and the joining of shard outputs (`circlet scan-merge`).
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "scan/scan_job.hpp"

namespace circlet {

/// Counts per t and verdict, candidates, proportional pairs; `ctx` (may be null)
/// provides series for the exact-count comparison of CONSTANT candidates.
nlohmann::json scan_summary(const std::vector<nlohmann::json>& rows, ScanContext* ctx);

/// The human summary text.
std::string scan_summary_text(const nlohmann::json& header, const std::string& shard, const nlohmann::json& summary);

/// Writes scan.csv, scan.json, summary.txt into `dir` (rows sorted by job).
void write_scan_outputs(const std::string& dir, const nlohmann::json& header, const std::string& shard,
                        std::vector<nlohmann::json> rows, ScanContext* ctx);

/// Joins shard directories (each holding a complete scan.json of one shard i/k)
/// into `out_dir`; UserError when headers differ, a shard is missing or
/// repeated, or a job is missing or duplicated.
void merge_scan_outputs(const std::vector<std::string>& dirs, const std::string& out_dir);

/// The CSV columns of scan.csv.
std::string scan_csv_header();

}  // namespace circlet
