#include "scan/sqlite.hpp"

#include "core/error.hpp"

namespace circlet {

SqliteDb::SqliteDb(const std::string& path, bool read_only) : path_(path) {
  int flags = read_only ? SQLITE_OPEN_READONLY : (SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE);
  int rc = sqlite3_open_v2(path.c_str(), &db_, flags | SQLITE_OPEN_NOMUTEX, nullptr);
  if (rc != SQLITE_OK) {
    std::string msg = db_ ? sqlite3_errmsg(db_) : sqlite3_errstr(rc);
    sqlite3_close(db_);
    db_ = nullptr;
    throw UserError("cannot open database " + path + ": " + msg);
  }
  sqlite3_busy_timeout(db_, 5000);
  sqlite3_extended_result_codes(db_, 0);
}

SqliteDb::~SqliteDb() {
  if (db_) sqlite3_close_v2(db_);
}

void SqliteDb::fail(const std::string& context) const {
  throw UserError(path_ + ": " + context + ": " + sqlite3_errmsg(db_));
}

void SqliteDb::exec(const std::string& sql) {
  char* err = nullptr;
  if (sqlite3_exec(db_, sql.c_str(), nullptr, nullptr, &err) != SQLITE_OK) {
    std::string msg = err ? err : "unknown error";
    sqlite3_free(err);
    throw UserError(path_ + ": " + msg + " (in: " + sql.substr(0, 60) + ")");
  }
}

bool SqliteDb::has_table(const std::string& name) {
  SqliteStatement s(*this, "SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = ?");
  s.bind_text(1, name);
  return s.step();
}

SqliteStatement::SqliteStatement(SqliteDb& db, const std::string& sql) : db_(db) {
  if (sqlite3_prepare_v2(db.get(), sql.c_str(), -1, &st_, nullptr) != SQLITE_OK)
    db.fail("cannot prepare '" + sql.substr(0, 60) + "'");
}

SqliteStatement::~SqliteStatement() { sqlite3_finalize(st_); }

void SqliteStatement::bind_null(int i) { CIRCLET_ASSERT(sqlite3_bind_null(st_, i) == SQLITE_OK, "sqlite bind"); }
void SqliteStatement::bind_int(int i, long long v) {
  CIRCLET_ASSERT(sqlite3_bind_int64(st_, i, v) == SQLITE_OK, "sqlite bind");
}
void SqliteStatement::bind_text(int i, const std::string& v) {
  CIRCLET_ASSERT(sqlite3_bind_text(st_, i, v.data(), static_cast<int>(v.size()), SQLITE_TRANSIENT) == SQLITE_OK,
                 "sqlite bind");
}

bool SqliteStatement::step() {
  int rc = sqlite3_step(st_);
  if (rc == SQLITE_ROW) return true;
  if (rc == SQLITE_DONE) return false;
  db_.fail("query failed");
}

void SqliteStatement::reset() {
  sqlite3_reset(st_);
  sqlite3_clear_bindings(st_);
}

int SqliteStatement::columns() const { return sqlite3_column_count(st_); }
bool SqliteStatement::is_null(int c) const { return sqlite3_column_type(st_, c) == SQLITE_NULL; }
int SqliteStatement::type(int c) const { return sqlite3_column_type(st_, c); }
long long SqliteStatement::int_at(int c) const { return sqlite3_column_int64(st_, c); }
std::string SqliteStatement::text_at(int c) const {
  const unsigned char* p = sqlite3_column_text(st_, c);
  return p ? std::string(reinterpret_cast<const char*>(p), static_cast<size_t>(sqlite3_column_bytes(st_, c)))
           : std::string();
}
std::string SqliteStatement::column_name(int c) const { return sqlite3_column_name(st_, c); }

SqliteTransaction::SqliteTransaction(SqliteDb& db) : db_(db) { db_.exec("BEGIN IMMEDIATE"); }
SqliteTransaction::~SqliteTransaction() {
  if (!done_) sqlite3_exec(db_.get(), "ROLLBACK", nullptr, nullptr, nullptr);
}
void SqliteTransaction::commit() {
  db_.exec("COMMIT");
  done_ = true;
}

}  // namespace circlet
