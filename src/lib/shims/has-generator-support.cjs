'use strict';

// Stands in for @stdlib/assert-has-generator-support, whose probe calls eval(): the page's
// Content-Security-Policy refuses eval and reports it. Every browser and Node we run has generators.
module.exports = function hasGeneratorSupport() {
	return true;
};
