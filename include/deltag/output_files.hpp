// Writing the files of a run all together or not at all. The one place where deltag writes
// files; the report writers only format strings.
#pragma once

#include <functional>
#include <string>
#include <string_view>
#include <vector>

namespace deltag::io {

// A file to write: where, what, and the option or case key that named it (for messages).
struct OutputFile {
    std::string path;
    std::string content;
    std::string key;     // e.g. "--output", "sweep[1].csv"
};

// Writes every file or, as far as the system allows, none:
//   1. each regular file's content goes to a new temporary file in its target's directory
//      (".NAME.deltag-tmp-PID-N"), flushed to disk, with the permissions of the file it
//      replaces;
//   2. targets that are not regular files (a terminal, /dev/null, a pipe) are written in
//      place, since they cannot be replaced;
//   3. every temporary file is renamed over its target (atomic on POSIX file systems).
// A failure in 1 or 2 removes the temporary files and leaves every existing target as it
// was and no new file behind. A failure in 3 (rare: the checks of 1 already ruled out a
// directory in the way) leaves the files renamed so far in place and removes the rest.
// A symbolic link is followed: the file it points to is replaced, the link stays.
// Throws InputError(path, key, what went wrong with the system's reason).
void write_files_atomically(const std::vector<OutputFile>& files);

// One file written the same way, its content produced in pieces: `produce` is called once
// with a function that appends a piece, so a long table need not be held in memory. An
// exception from `produce` removes the temporary file and leaves the target as it was.
void write_file_atomically(const std::string& path, const std::string& key,
                           const std::function<void(const std::function<void(std::string_view)>&)>& produce);

}  // namespace deltag::io
