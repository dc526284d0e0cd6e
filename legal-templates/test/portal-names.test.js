'use strict';
const assert = require('node:assert/strict');
const fs = require('node:fs');
const path = require('node:path');
const { test } = require('node:test');
const { templates, readTemplateSource } = require('..');

// The participant's screens, whose button and section names the templates tell people to look for.
const portalSource = path.join(__dirname, '..', '..', 'portal', 'src');

function sourceFiles(folder) {
  return fs.readdirSync(folder, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(folder, entry.name);
    if (entry.isDirectory()) return entry.name === 'test' ? [] : sourceFiles(full);
    return /\.tsx?$/.test(entry.name) && !/\.test\.tsx?$/.test(entry.name) ? [full] : [];
  });
}

/** Every piece of text the portal can put on screen: JSX text between tags and string literals, whitespace folded. */
function portalTexts() {
  const texts = new Set();
  const fold = (text) => text.replace(/\s+/g, ' ').trim();
  for (const file of sourceFiles(portalSource)) {
    const source = fs.readFileSync(file, 'utf8');
    for (const match of source.matchAll(/>([^<>{}]+)</g)) texts.add(fold(match[1]));
    for (const match of source.matchAll(/'([^'\n]*)'|"([^"\n]*)"|`([^`$]*)`/g)) texts.add(fold(match[1] ?? match[2] ?? match[3]));
  }
  texts.delete('');
  return texts;
}

test('every name a template puts in quotes is a section of that form or a button or heading on the portal screens', () => {
  const onScreen = portalTexts();
  assert.ok(onScreen.has('Stop taking part') && onScreen.has('Sign the form'), 'the portal source was read');
  const problems = [];
  for (const template of templates) {
    // Comments (the staff notice, element markers) are never shown to participants.
    const source = readTemplateSource(template.id).replace(/<!--[\s\S]*?-->/g, '');
    const sections = new Set([...source.matchAll(/^#{1,6}\s+(.+?)\s*$/gm)].map((match) => match[1]));
    for (const [, name] of source.matchAll(/[“"]([^”"\n]+)[”"]/g)) {
      if (!sections.has(name) && !onScreen.has(name)) problems.push(`${template.id}: “${name}” is neither a section of the form nor on a portal screen`);
    }
  }
  assert.deepEqual(problems, []);
});
