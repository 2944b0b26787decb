import { reportBody } from './design-file.service';

describe('reportBody', () => {
  it('keeps only the body and prefixes every id and each reference to one, so reports can share a document', () => {
    const html =
      '<!DOCTYPE html><html><head><style>h2{}</style></head><body class="r">' +
      '<figure id="fig-torque"><svg><clipPath id="torque-clip-1"></clipPath><g clip-path="url(#torque-clip-1)"></g></svg></figure>' +
      '<a href="#fig-torque">Fig.</a><a href="https://example.invalid/#x">out</a></body></html>';
    expect(reportBody(html, 'r2')).toBe(
      '<figure id="r2-fig-torque"><svg><clipPath id="r2-torque-clip-1"></clipPath><g clip-path="url(#r2-torque-clip-1)"></g></svg></figure>' +
        '<a href="#r2-fig-torque">Fig.</a><a href="https://example.invalid/#x">out</a>',
    );
  });
});
