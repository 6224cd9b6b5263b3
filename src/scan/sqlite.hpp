#pragma once
// A thin RAII layer over SQLite's C API (libsqlite3): a connection, a prepared
// statement and a transaction. Errors of the database (cannot open, malformed
// file, disk full) are UserError naming the file and SQLite's message; misuse
// (binding to a column that does not exist) is CIRCLET_ASSERT.
#include <sqlite3.h>

#include <string>

namespace circlet {

class SqliteStatement;

class SqliteDb {
 public:
  /// Opens (read_only) or opens-or-creates `path`; UserError on failure.
  SqliteDb(const std::string& path, bool read_only);
  SqliteDb(const SqliteDb&) = delete;
  SqliteDb& operator=(const SqliteDb&) = delete;
  ~SqliteDb();
  /// Runs one or more statements without results; UserError naming `what` on failure.
  void exec(const std::string& sql);
  sqlite3* get() const { return db_; }
  const std::string& path() const { return path_; }
  /// UserError "<path>: <context>: <sqlite message>".
  [[noreturn]] void fail(const std::string& context) const;
  /// Does a table of this name exist?
  bool has_table(const std::string& name);

 private:
  sqlite3* db_ = nullptr;
  std::string path_;
};

class SqliteStatement {
 public:
  SqliteStatement(SqliteDb& db, const std::string& sql);
  SqliteStatement(const SqliteStatement&) = delete;
  SqliteStatement& operator=(const SqliteStatement&) = delete;
  ~SqliteStatement();
  // Parameters are numbered from 1, as in SQLite.
  void bind_null(int i);
  void bind_int(int i, long long v);
  void bind_text(int i, const std::string& v);
  /// One step: true while a result row is available, false when done.
  bool step();
  /// Resets for re-use (bindings are cleared too).
  void reset();
  // Columns are numbered from 0.
  int columns() const;
  bool is_null(int c) const;
  int type(int c) const;  // SQLITE_INTEGER, SQLITE_TEXT, ...
  long long int_at(int c) const;
  std::string text_at(int c) const;
  std::string column_name(int c) const;
  sqlite3_stmt* get() const { return st_; }

 private:
  SqliteDb& db_;
  sqlite3_stmt* st_ = nullptr;
};

/// BEGIN IMMEDIATE on construction; COMMIT on commit(); ROLLBACK if destroyed uncommitted.
class SqliteTransaction {
 public:
  explicit SqliteTransaction(SqliteDb& db);
  SqliteTransaction(const SqliteTransaction&) = delete;
  SqliteTransaction& operator=(const SqliteTransaction&) = delete;
  ~SqliteTransaction();
  void commit();

 private:
  SqliteDb& db_;
  bool done_ = false;
};

}  // namespace circlet
