'use strict';
const assert = require('node:assert/strict');
const fs = require('node:fs');
const { test } = require('node:test');
const { templates, fonts, readTemplateSource, findTemplate, STAFF_NOTICE } = require('..');

test('every template file exists and opens with a staff notice that it is not legal advice', () => {
  for (const template of templates) {
    const source = readTemplateSource(template.id);
    assert.match(source, /^<!--\s*\nSTAFF NOTICE/, template.id);
    assert.match(source.slice(0, source.indexOf('-->')), /not legal advice/, template.id);
    assert.equal(template.notice, STAFF_NOTICE);
  }
});

test('each template lists exactly the placeholders it uses', () => {
  for (const template of templates) {
    const used = new Set();
    for (const text of [readTemplateSource(template.id), template.subject ?? '']) {
      // Handlebars: {{name}}, {{#if name}}, {{#each name}}; closing tags and {{else}} name nothing.
      for (const match of text.matchAll(/\{\{\s*(?:#(?:if|unless|each)\s+)?([A-Za-z][\w.]*)\s*\}\}/g)) {
        if (match[1] !== 'else') used.add(match[1].split('.')[0]);
      }
    }
    // Names used only inside the consent form's {{#steps}} list belong to each step, not to the study.
    for (const stepField of ['position', 'title', 'pay', 'minutes', 'description']) used.delete(stepField);
    assert.deepEqual([...used].sort(), [...template.fields].sort(), template.id);
  }
});

test('the consent template marks the key information, every basic element of 45 CFR 46.116(b) and the optional (c) elements', () => {
  const source = readTemplateSource('consent/minimal-risk-paid-study');
  const markers = [...source.matchAll(/<!-- element: ([\w-]+) -->/g)].map((m) => m[1]);
  assert.deepEqual(markers, ['key-information', 'b1', 'b2', 'b3', 'b4', 'b5', 'b6', 'b7', 'b8', 'b9', 'c2', 'c4', 'c6', 'payment-terms', 'signature']);
});

test('the fonts are TrueType files shipped with their licence', () => {
  for (const file of [fonts.regular, fonts.bold]) {
    const head = fs.readFileSync(file).subarray(0, 4);
    assert.deepEqual([...head], [0x00, 0x01, 0x00, 0x00], `${file} has the TrueType 1.0 signature`);
  }
  assert.match(fs.readFileSync(fonts.licence, 'utf8'), /Bitstream Vera Fonts Copyright/);
});

test('an unknown template id is refused by name', () => {
  assert.throws(() => findTemplate('consent/nope'), /templateId: no template "consent\/nope"/);
});
