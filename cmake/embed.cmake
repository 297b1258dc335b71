# Writes OUTPUT: a C++ file whose function returns the text of INPUT.
file(READ ${INPUT} content)
string(LENGTH "${content}" n)
# Split into chunks: string literals longer than 64 KiB upset some compilers.
set(chunks "")
set(pos 0)
while(pos LESS n)
  string(SUBSTRING "${content}" ${pos} 16000 piece)
  string(APPEND chunks "    R\"deltagdb(${piece})deltagdb\"\n")
  math(EXPR pos "${pos} + 16000")
endwhile()
file(WRITE ${OUTPUT} "// Generated from databases/core.toml at build time. Do not edit.\n#include <string_view>\nnamespace deltag::thermo {\nstd::string_view embedded_core_text() {\n  static const char text[] =\n${chunks}    \"\";\n  return std::string_view(text, sizeof(text) - 1);\n}\n}  // namespace deltag::thermo\n")
