#pragma once
// Our own small SVG layer: an element tree written out with escaped text and
// fixed-precision numbers, so the same figure always gives the same bytes.
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace overshoot::render::svg {

// Escapes &, <, >, " and ' for XML text and attribute values.
std::string escape(std::string_view text);

// A coordinate or size: at most two decimals, trailing zeros dropped, never "-0".
std::string num(double x);

struct Element {
    std::string tag;
    std::vector<std::pair<std::string, std::string>> attrs;
    std::string text;  // character data (escaped on output), written before the children
    std::vector<Element> children;

    explicit Element(std::string tag_name) : tag(std::move(tag_name)) {}
    Element& set(std::string name, std::string value);
    Element& set(std::string name, const char* value) { return set(std::move(name), std::string(value)); }
    Element& set(std::string name, double value);
    Element& set(std::string name, int value) { return set(std::move(name), static_cast<double>(value)); }
    Element& content(std::string t);
    Element& add(Element child);  // returns *this, for chaining
    Element& last() { return children.back(); }

    // Indented XML, one element per line; text-only elements stay on one line.
    void write(std::string& out, int depth = 0) const;
    std::string str() const;
};

// Shapes used by every figure.
Element line(double x1, double y1, double x2, double y2, std::string_view stroke, double width);
Element rect(double x, double y, double w, double h, std::string_view fill);
Element circle(double cx, double cy, double r, std::string_view fill);
// anchor: start, middle or end.
Element text(double x, double y, std::string content, double size = 12, std::string_view anchor = "start");
Element polyline(const std::vector<std::pair<double, double>>& points, std::string_view stroke, double width);
Element polygon(const std::vector<std::pair<double, double>>& points, std::string_view fill);

// The root <svg> element with the namespace, a viewBox, a <title> and a <desc>
// (read by screen readers; the title is also shown as a tooltip).
Element document(double width, double height, std::string title, std::string description);

// A stand-alone .svg file: the XML declaration, then the element.
std::string file(const Element& root);

}  // namespace overshoot::render::svg
