'use strict'

// Stands in for @stdlib/assert-has-generator-support in the browser bundle (nuxt.config.ts, vite
// alias). That module asks eval whether generator functions parse, which the Content-Security-Policy
// forbids (the page reported it as a violation); every browser Mantissa supports has them (ES2015).
module.exports = function hasGeneratorSupport() {
  return true
}
