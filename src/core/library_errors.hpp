#pragma once
// FLINT and NTL end the process with abort() on a failed allocation (exit
// status 134, "Aborted"). install_library_error_handlers() replaces that by one
// line "circlet: error: out of memory (…)" and exit status 2, the same as a
// std::bad_alloc caught in main(); other fatal library errors become
// "circlet: internal error: …" with status 3. NTL keeps its handler per
// thread, so every thread that calls NTL installs it (the series workers do).
namespace circlet {

void install_library_error_handlers();

}  // namespace circlet
