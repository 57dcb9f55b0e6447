// MathJax reads the equations that pymdownx.arithmatex (generic mode) wraps in \( \) and \[ \].
window.MathJax = {
  tex: { inlineMath: [["\\(", "\\)"]], displayMath: [["\\[", "\\]"]], processEscapes: true, processEnvironments: true },
  options: { ignoreHtmlClass: ".*|", processHtmlClass: "arithmatex" },
};
