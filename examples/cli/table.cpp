#include "table.hpp"

#include <algorithm>

namespace tfcli {

std::size_t display_width(std::string_view s) {
    std::size_t n = 0;
    for (const char c : s)
        if ((static_cast<unsigned char>(c) & 0xC0) != 0x80) ++n;
    return n;
}

text_table::text_table(std::vector<std::string> headers, std::string aligns)
    : headers_(std::move(headers)), aligns_(std::move(aligns)) {
    aligns_.resize(headers_.size(), 'l');
}

void text_table::add(std::vector<std::string> row) {
    row.resize(headers_.size());
    rows_.push_back(std::move(row));
}

std::string text_table::render(std::string_view indent) const {
    std::vector<std::size_t> width(headers_.size(), 0);
    for (std::size_t c = 0; c < headers_.size(); ++c) {
        width[c] = display_width(headers_[c]);
        for (const auto& r : rows_) width[c] = std::max(width[c], display_width(r[c]));
    }
    auto line = [&](const std::vector<std::string>& cells) {
        std::string s(indent);
        for (std::size_t c = 0; c < cells.size(); ++c) {
            const std::size_t pad = width[c] - display_width(cells[c]);
            if (c) s += "  ";
            if (aligns_[c] == 'r') s.append(pad, ' ');
            s += cells[c];
            if (aligns_[c] != 'r') s.append(pad, ' ');
        }
        while (!s.empty() && s.back() == ' ') s.pop_back();
        return s + "\n";
    };
    std::string out = line(headers_);
    for (const auto& r : rows_) out += line(r);
    return out;
}

}  // namespace tfcli
