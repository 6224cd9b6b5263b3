#include "scan/results_db.hpp"

#include <sys/stat.h>

#include "core/error.hpp"
#include "core/provenance.hpp"
#include "progression/certify.hpp"
#include "scan/scan_job.hpp"

namespace circlet {

const std::vector<ScanColumn>& scan_columns() {
  static const std::vector<ScanColumn> cols = {
      {"job", 'i'},      {"t", 'i'},           {"F", 't'},           {"G", 't'},
      {"A", 'i'},        {"B", 'i'},           {"A2", 'i'},          {"B2", 'i'},
      {"verdict", 't'},  {"Q", 'i'},           {"prime", 'i'},       {"modulus", 't'},
      {"r1", 't'},       {"r2", 't'},          {"limit1", 't'},      {"limit2", 't'},
      {"k", 't'},        {"constant", 't'},    {"contains_integer", 'b'}, {"prec", 'i'},
      {"verified", 'b'}, {"verify_failure", 't'}, {"reason", 't'},   {"proportional_subclasses", 'j'},
      {"limit1_ball", 'j'}, {"limit2_ball", 'j'}};
  return cols;
}

ScanSpec scan_spec_from_header(const nlohmann::json& h) {
  try {
    ScanSpec spec;
    spec.t_lo = h.at("t_lo").get<int>();
    spec.t_hi = h.at("t_hi").get<int>();
    spec.M = h.at("modulus").get<long>();
    spec.pair = FamilyPair::parse(h.at("pair").get<std::string>());
    if (spec.M < 1 || spec.t_lo > spec.t_hi) throw UserError("bad range");
    spec.validate();
    return spec;
  } catch (const nlohmann::json::exception& e) {
    throw UserError(std::string("malformed scan header: ") + e.what());
  }
}

namespace {
std::string create_sql() {
  std::string s = "CREATE TABLE plan(key TEXT PRIMARY KEY, value TEXT NOT NULL);\nCREATE TABLE pairs(";
  bool first = true;
  for (const auto& c : scan_columns()) {
    s += first ? "" : ", ";
    first = false;
    s += c.name;
    s += (c.type == 'i' || c.type == 'b') ? " INTEGER" : " TEXT";
    if (std::string(c.name) == "job") s += " PRIMARY KEY";
    if (std::string(c.name) == "t" || std::string(c.name) == "verdict") s += " NOT NULL";
  }
  s += ");\nCREATE INDEX pairs_t ON pairs(t);\nCREATE INDEX pairs_verdict ON pairs(verdict);\n"
       "CREATE INDEX pairs_prime ON pairs(prime);\n";
  return s;
}
std::string insert_sql(const char* verb) {
  std::string s = std::string(verb) + " INTO pairs(", v;
  for (const auto& c : scan_columns()) {
    s += (v.empty() ? "" : ", ") + std::string(c.name);
    v += v.empty() ? "?" : ", ?";
  }
  return s + ") VALUES (" + v + ")";
}
bool exists(const std::string& path) {
  struct stat st;
  return ::stat(path.c_str(), &st) == 0;
}
}  // namespace

ResultsDb::ResultsDb(const std::string& path, Mode mode, const nlohmann::json& header, const std::string& shard)
    : db_([&] {
        if (mode == Mode::Create && exists(path))
          throw UserError("results database " + path +
                          " already exists: pass --resume to continue that scan, or use a new directory");
        if (mode != Mode::Create && !exists(path)) throw UserError("cannot read " + path + ": no such file");
        return path;
      }(), mode == Mode::Read) {
  if (mode == Mode::Create) {
    db_.exec("PRAGMA journal_mode = WAL; PRAGMA synchronous = NORMAL;");
    SqliteTransaction tx(db_);
    db_.exec(create_sql());
    set_plan_value("format", kScanDbFormat);
    set_plan_value("header", header.dump());
    set_plan_value("shard", shard);
    set_plan_value("job_count", std::to_string(scan_spec_from_header(header).job_count()));
    set_plan_value("created_by", Provenance::now(command_line(), header.value("prec", 0L)).to_json().dump());
    tx.commit();
    header_ = header;
    shard_ = shard;
  } else {
    {
      std::string result;
      try {
        SqliteStatement check(db_, "PRAGMA quick_check");
        while (check.step()) result += (result.empty() ? "" : "; ") + check.text_at(0);
      } catch (const UserError& e) {
        result = e.what();
      }
      if (sqlite3_errcode(db_.get()) == SQLITE_NOTADB)
        throw UserError(path + " is not a circlet scan database (not an SQLite file)");
      if (result != "ok")
        throw UserError(path + " is damaged (" + result.substr(0, 200) +
                        "); it was left unchanged: recover its intact rows with `sqlite3 " + path +
                        " .recover`, or start a new scan");
    }
    if (!db_.has_table("plan") || !db_.has_table("pairs"))
      throw UserError(path + " is not a circlet scan database (no plan or pairs table)");
    std::string format = plan_value("format");
    if (format != kScanDbFormat)
      throw UserError(path + " is not a circlet scan database (format '" + format + "', expected " + kScanDbFormat + ")");
    std::string h = plan_value("header");
    if (h.empty()) throw UserError(path + ": the plan has no scan header (the file was edited or damaged)");
    try {
      header_ = nlohmann::json::parse(h);
    } catch (const nlohmann::json::exception&) {
      throw UserError(path + ": the scan header in its plan is not JSON (the file was edited or damaged)");
    }
    shard_ = plan_value("shard");
    if (shard_.empty()) throw UserError(path + ": the plan names no shard (the file was edited or damaged)");
    if (mode == Mode::Resume) {
      if (header_ != header)
        throw UserError("results database " + path + " belongs to another scan (plan " + header_.dump() +
                        ", this scan " + header.dump() + ")");
      if (shard_ != shard)
        throw UserError("results database " + path + " belongs to shard " + shard_ + ", not " + shard);
      db_.exec("PRAGMA journal_mode = WAL; PRAGMA synchronous = NORMAL;");
    }
  }
  if (mode != Mode::Read) {
    insert_ = std::make_unique<SqliteStatement>(db_, insert_sql("INSERT OR IGNORE"));
    replace_ = std::make_unique<SqliteStatement>(db_, insert_sql("INSERT OR REPLACE"));
  }
}

std::string ResultsDb::plan_value(const std::string& key) {
  SqliteStatement s(db_, "SELECT value FROM plan WHERE key = ?");
  s.bind_text(1, key);
  return s.step() ? s.text_at(0) : std::string();
}

void ResultsDb::set_plan_value(const std::string& key, const std::string& value) {
  SqliteStatement s(db_, "INSERT OR REPLACE INTO plan(key, value) VALUES (?, ?)");
  s.bind_text(1, key);
  s.bind_text(2, value);
  s.step();
}

void ResultsDb::bind_row(SqliteStatement& s, const nlohmann::json& row) {
  const auto& cols = scan_columns();
  size_t used = 0;
  for (size_t i = 0; i < cols.size(); ++i) {
    const int p = static_cast<int>(i) + 1;
    auto it = row.find(cols[i].name);
    if (it == row.end() || it->is_null()) {
      s.bind_null(p);
      continue;
    }
    ++used;
    switch (cols[i].type) {
      case 'i': s.bind_int(p, it->get<long long>()); break;
      case 'b': s.bind_int(p, it->get<bool>() ? 1 : 0); break;
      case 't': s.bind_text(p, it->get<std::string>()); break;
      default: s.bind_text(p, it->dump()); break;
    }
  }
  CIRCLET_ASSERT(used == row.size(), "scan row has a key that is not a column of the results database: " + row.dump());
}

bool ResultsDb::insert(const nlohmann::json& row) {
  insert_->reset();
  bind_row(*insert_, row);
  insert_->step();
  return sqlite3_changes(db_.get()) == 1;
}

void ResultsDb::replace(const nlohmann::json& row) {
  replace_->reset();
  bind_row(*replace_, row);
  replace_->step();
}

void ResultsDb::erase(long job) {
  SqliteStatement s(db_, "DELETE FROM pairs WHERE job = ?");
  s.bind_int(1, job);
  s.step();
}

long ResultsDb::count() {
  SqliteStatement s(db_, "SELECT count(*) FROM pairs");
  s.step();
  return static_cast<long>(s.int_at(0));
}

void ResultsDb::for_each_row(const std::function<void(const nlohmann::json&, const std::string&)>& f,
                             const std::string& where) {
  std::string sql = "SELECT ";
  const auto& cols = scan_columns();
  for (size_t i = 0; i < cols.size(); ++i) sql += (i ? ", " : "") + std::string(cols[i].name);
  sql += " FROM pairs" + (where.empty() ? std::string() : " WHERE " + where) + " ORDER BY job";
  SqliteStatement s(db_, sql);
  while (s.step()) {
    nlohmann::json row = nlohmann::json::object();
    std::string problem;
    for (size_t i = 0; i < cols.size(); ++i) {
      const int c = static_cast<int>(i);
      const int type = s.type(c);
      if (type == SQLITE_NULL) continue;
      const char want = cols[i].type;
      const bool is_int = type == SQLITE_INTEGER, is_text = type == SQLITE_TEXT;
      if (((want == 'i' || want == 'b') && !is_int) || ((want == 't' || want == 'j') && !is_text)) {
        if (problem.empty()) problem = std::string("column ") + cols[i].name + " has the wrong type";
        continue;
      }
      switch (want) {
        case 'i': row[cols[i].name] = static_cast<long>(s.int_at(c)); break;
        case 'b': row[cols[i].name] = s.int_at(c) != 0; break;
        case 't': row[cols[i].name] = s.text_at(c); break;
        default:
          try {
            row[cols[i].name] = nlohmann::json::parse(s.text_at(c));
          } catch (const nlohmann::json::exception&) {
            if (problem.empty()) problem = std::string("column ") + cols[i].name + " is not JSON";
          }
      }
    }
    f(row, problem);
  }
}

std::string check_row_against_plan(const nlohmann::json& row, const ScanSpec& spec, const ShardSpec& shard) {
  if (!row.contains("job")) return "no job number";
  const long job = row["job"].get<long>();
  if (job < 0 || job >= spec.job_count())
    return "job " + std::to_string(job) + " is outside the plan (0.." + std::to_string(spec.job_count() - 1) + ")";
  if (!shard.owns(job)) return "job " + std::to_string(job) + " does not belong to shard " + shard.str();
  const ScanJob j = scan_job(spec, job);
  const std::string at = "job " + std::to_string(job) + ": ";
  auto int_is = [&](const char* k, long v) { return row.contains(k) && row[k].is_number_integer() && row[k].get<long>() == v; };
  auto str_is = [&](const char* k, const std::string& v) { return row.contains(k) && row[k].is_string() && row[k] == v; };
  if (!int_is("t", j.t) || !str_is("F", j.F.name()) || !str_is("G", j.G.name()) || !int_is("A", j.ap.A) ||
      !int_is("B", j.ap.B) || !int_is("A2", j.ap2.A) || !int_is("B2", j.ap2.B))
    return at + "the pair differs from the plan's (" + j.F.name() + "(" + std::to_string(j.ap.A) + "n+" +
           std::to_string(j.ap.B) + ") vs " + j.G.name() + "(" + std::to_string(j.ap2.A) + "n+" +
           std::to_string(j.ap2.B) + "))";
  if (!row.contains("verdict") || !row["verdict"].is_string()) return at + "no verdict";
  const std::string v = row["verdict"].get<std::string>();
  if (scan_uses_certificates(j.F.rank())) {
    if (v != "NON-CONVERGENT" && v != "CONSTANT" && v != "UNDECIDED") return at + "unknown verdict '" + v + "'";
    if (v == "NON-CONVERGENT" && (!row.contains("Q") || !row.contains("prime") || !row.contains("limit1_ball") ||
                                  !row.contains("limit2_ball")))
      return at + "NON-CONVERGENT without Q, prime or limit intervals";
    if (v == "CONSTANT" && !row.contains("constant")) return at + "CONSTANT without its constant";
  } else if (v != "PROPORTIONAL" && v != "BOTH-VANISH" && v != "NOT-PROPORTIONAL") {
    return at + "unknown verdict '" + v + "' for an exact comparison";
  }
  if (!row.contains("reason") || !row["reason"].is_string()) return at + "no reason";
  return "";
}

bool row_needs_recomputation(const nlohmann::json& row) {
  const std::string v = row.value("verdict", std::string());
  return v == "CONSTANT" || v == "PROPORTIONAL" || row.value("contains_integer", false);
}

}  // namespace circlet
