// Parses an SVG written by `tauforge --svg` with expat (Debian: libexpat1-dev) and
// checks that it is well-formed XML holding the plot's elements:
//   svg_check FILE.svg THRESHOLDS   (THRESHOLDS: the threshold lines the network draws)
// the <svg> root in the SVG namespace with a <title>; one polyline each of classes
// nominal, corner-min and corner-max, each with at least 50 points inside the view box;
// the envelope polygon; the threshold lines; 40 histogram bars; the spec-window
// rectangle; two worst-case lines.
#include <expat.h>

#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <iostream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

namespace {

struct state {
    int depth = 0;
    std::string root, root_ns;
    bool title = false;
    std::map<std::string, int> count;  // "element.class" -> occurrences
    std::vector<std::string> polyline_points;
    std::vector<std::string> polyline_class;
};

void start(void* data, const XML_Char* name, const XML_Char** attrs) {
    auto* s = static_cast<state*>(data);
    const std::string el = name;
    std::map<std::string, std::string> a;
    for (int i = 0; attrs[i]; i += 2) a[attrs[i]] = attrs[i + 1];
    if (s->depth++ == 0) {
        s->root = el;
        s->root_ns = a["xmlns"];
    }
    if (el == "title") s->title = true;
    std::istringstream classes(a["class"]);
    for (std::string c; classes >> c;) ++s->count[el + "." + c];
    if (el == "polyline") {
        s->polyline_points.push_back(a["points"]);
        s->polyline_class.push_back(a["class"]);
    }
}

void end(void* data, const XML_Char*) { --static_cast<state*>(data)->depth; }

}  // namespace

int main(int argc, char** argv) {
    if (argc != 3) {
        std::cerr << "usage: svg_check FILE.svg THRESHOLDS\n";
        return 2;
    }
    std::ifstream in(argv[1], std::ios::binary);
    std::stringstream buf;
    buf << in.rdbuf();
    const std::string text = buf.str();
    if (!in || text.empty()) {
        std::cerr << "FAIL: cannot read " << argv[1] << "\n";
        return 1;
    }
    state s;
    XML_Parser p = XML_ParserCreate("UTF-8");
    XML_SetUserData(p, &s);
    XML_SetElementHandler(p, start, end);
    if (XML_Parse(p, text.data(), static_cast<int>(text.size()), 1) == XML_STATUS_ERROR) {
        std::cerr << "FAIL: not well-formed XML at line " << XML_GetCurrentLineNumber(p) << ": "
                  << XML_ErrorString(XML_GetErrorCode(p)) << "\n";
        XML_ParserFree(p);
        return 1;
    }
    XML_ParserFree(p);
    int failures = 0;
    auto expect = [&](bool ok, const std::string& what) {
        if (!ok) {
            std::cerr << "FAIL: " << what << "\n";
            ++failures;
        }
    };
    expect(s.root == "svg", "root element <svg>, got <" + s.root + ">");
    expect(s.root_ns == "http://www.w3.org/2000/svg", "the SVG namespace");
    expect(s.title, "a <title>");
    for (const char* c : {"polyline.nominal", "polyline.corner-min", "polyline.corner-max", "polygon.envelope",
                          "rect.spec-window"})
        expect(s.count[c] == 1, std::string("one ") + c + ", got " + std::to_string(s.count[c]));
    expect(s.count["line.threshold"] == std::atoi(argv[2]),
           "threshold lines: " + std::to_string(s.count["line.threshold"]) + ", expected " + argv[2]);
    expect(s.count["rect.bar"] == 40, "40 histogram bars, got " + std::to_string(s.count["rect.bar"]));
    expect(s.count["line.worst-case"] == 2, "two worst-case lines, got " + std::to_string(s.count["line.worst-case"]));
    for (std::size_t i = 0; i < s.polyline_points.size(); ++i) {
        std::istringstream pts(s.polyline_points[i]);
        int n = 0;
        bool inside = true;
        for (std::string xy; pts >> xy; ++n) {
            double x = 0, y = 0;
            if (std::sscanf(xy.c_str(), "%lf,%lf", &x, &y) != 2) inside = false;
            inside = inside && x >= 0 && x <= 860 && y >= 0 && y <= 740;
        }
        expect(n >= 50, s.polyline_class[i] + ": at least 50 points, got " + std::to_string(n));
        expect(inside, s.polyline_class[i] + ": every point inside the 860 x 740 view box");
    }
    if (failures) std::cerr << failures << " check(s) failed\n";
    return failures ? 1 : 0;
}
