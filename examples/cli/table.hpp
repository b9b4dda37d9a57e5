#pragma once
/// Aligned text tables for the human report, padded by display width so that
/// UTF-8 units (Ω, µ, ±, °) line up.

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace tfcli {

/// Characters on screen of a UTF-8 string (every code point one column).
std::size_t display_width(std::string_view s);

class text_table {
public:
    /// `aligns`: one letter per column, 'l' or 'r'.
    text_table(std::vector<std::string> headers, std::string aligns);
    void add(std::vector<std::string> row);
    /// The table, each line starting with `indent`, no trailing blanks.
    std::string render(std::string_view indent = "  ") const;
    bool empty() const { return rows_.empty(); }

private:
    std::vector<std::string> headers_;
    std::string aligns_;
    std::vector<std::vector<std::string>> rows_;
};

}  // namespace tfcli
