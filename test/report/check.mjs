// Checks the demo report as headless Chromium rendered it.
//   node check.mjs DOM.html SHOT.png
// DOM.html: chromium --dump-dom output, whose <pre id="selfcheck"> the
// page's own script filled with what the browser laid out in each SVG map
// (elements with a non-empty bounding box).  SHOT.png: chromium --screenshot;
// decoded here (PNG, RFC 2083: zlib IDAT, per-row filters) to count the
// pixels of the map colours.  Prints TAP lines; exits 1 on any failure.
import { readFileSync } from 'node:fs';
import { inflateSync } from 'node:zlib';

let n = 0;
let bad = 0;
function ok(cond, what, detail) {
	n++;
	if (cond) console.log(`ok ${n} - ${what}`);
	else { bad++; console.log(`not ok ${n} - ${what}${detail ? ': ' + detail : ''}`); }
}

// Decodes an 8-bit RGB or RGBA non-interlaced PNG into {width, height, px(x, y)}.
function decodePng(buf) {
	if (buf.readUInt32BE(0) !== 0x89504e47) throw new Error('not a PNG');
	let off = 8, width = 0, height = 0, bpp = 0;
	const idat = [];
	while (off < buf.length) {
		const len = buf.readUInt32BE(off);
		const type = buf.toString('ascii', off + 4, off + 8);
		const data = buf.subarray(off + 8, off + 8 + len);
		if (type === 'IHDR') {
			width = data.readUInt32BE(0);
			height = data.readUInt32BE(4);
			if (data[8] !== 8 || data[12] !== 0 || (data[9] !== 2 && data[9] !== 6))
				throw new Error('unsupported PNG format');
			bpp = data[9] === 6 ? 4 : 3;
		} else if (type === 'IDAT') idat.push(data);
		off += 12 + len;
	}
	const raw = inflateSync(Buffer.concat(idat));
	const stride = width * bpp;
	const out = Buffer.alloc(height * stride);
	for (let y = 0; y < height; y++) {
		const f = raw[y * (stride + 1)];
		for (let i = 0; i < stride; i++) {
			const x = raw[y * (stride + 1) + 1 + i];
			const a = i >= bpp ? out[y * stride + i - bpp] : 0;
			const b = y > 0 ? out[(y - 1) * stride + i] : 0;
			const c = i >= bpp && y > 0 ? out[(y - 1) * stride + i - bpp] : 0;
			let v;
			if (f === 0) v = x;
			else if (f === 1) v = x + a;
			else if (f === 2) v = x + b;
			else if (f === 3) v = x + ((a + b) >> 1);
			else {
				const p = a + b - c, pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
				v = x + (pa <= pb && pa <= pc ? a : pb <= pc ? b : c);
			}
			out[y * stride + i] = v & 255;
		}
	}
	return { width, height, px: (x, y) => [out[y * stride + x * bpp], out[y * stride + x * bpp + 1], out[y * stride + x * bpp + 2]] };
}

const [domFile, pngFile] = process.argv.slice(2);
const dom = readFileSync(domFile, 'utf8');
const m = dom.match(/<pre id="selfcheck">([^<]*)<\/pre>/);
ok(m && m[1].length > 0, 'the page script ran and reported its maps', m ? 'empty' : 'no selfcheck element');
const maps = m && m[1] ? JSON.parse(m[1].replace(/&quot;/g, '"')).maps : [];
ok(maps.length >= 6, `at least 6 SVG maps laid out (found ${maps.length})`);
ok(maps.every((s) => s.route === 1 && s.trip === 1), 'every map draws its line and its trip');
ok(maps.every((s) => s.leashes === 1 && s.bottleneck === 1), 'every map draws the leashes and the longest leash');
ok(maps.every((s) => s.width >= 300), 'every map is at least 300 px wide on the page');
const detours = maps.filter((s) => /detour/.test(dom.split(`id="${s.id}"`)[0].split('<section').pop()));
ok(detours.length >= 3 && detours.every((s) => s.excursions >= 1), `the detour maps (${detours.length}) highlight their excursions`);
ok(maps.reduce((k, s) => k + s.excursions, 0) >= maps.length, 'excursions drawn across the maps');
ok(!/<(script|link|img|iframe)[^>]*\s(src|href)=/i.test(readFileSync(domFile, 'utf8')), 'self-contained: no external scripts, styles or images');

const png = decodePng(readFileSync(pngFile));
let blue = 0, red = 0, dark = 0, paper = 0;
for (let y = 0; y < png.height; y++)
	for (let x = 0; x < png.width; x++) {
		const [r, g, b] = png.px(x, y);
		if (b > r + 35 && b > g + 10) blue++;                 // the planned line
		if (r > g + 90 && r > b + 90) red++;                  // excursions
		if (r < 70 && g < 70 && b < 80) dark++;               // trips and text
		if (Math.abs(r - 247) < 4 && Math.abs(g - 245) < 4 && Math.abs(b - 239) < 4) paper++;  // map ground
	}
const total = png.width * png.height;
ok(png.width >= 1000 && png.height >= 1000, `screenshot ${png.width}x${png.height}`);
ok(paper > total * 0.05, `map ground painted (${(100 * paper / total).toFixed(1)} % of pixels)`);
ok(blue > 2000, `planned lines painted (${blue} pixels)`);
ok(red > 300, `excursions painted in red (${red} pixels)`);
ok(dark > 5000, `trips and text painted (${dark} pixels)`);
console.log(`1..${n}`);
process.exit(bad ? 1 : 0);
