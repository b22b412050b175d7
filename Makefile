SHELL := /bin/bash
# Pairline — build, serve and test. `make run` and `make test` are all a new
# machine needs (see README.md).

ADDR      ?= 127.0.0.1:8000
GO        ?= go
WASM_LDFLAGS := -s -w
# The browser build uses a copy of go-app without its HTTP server
# (testdata/wasmdeps writes it and a go.work that points the build at it):
# go-app's server files have no build constraint, and through them net/http
# and crypto/tls cost about 1.6 MB of app.wasm that never runs in a page
# (see DEVELOPERS.md, "What app.wasm is made of"). The native command keeps
# go-app as the module cache holds it.
WASMDEPS  := bin/wasmdeps
WASM_ENV   = GOWORK="$(CURDIR)/$(WASMDEPS)/go.work" GOOS=js GOARCH=wasm
# The screen's packages are compiled without inlining in the browser build:
# go-app's chains of element calls inlined cost about 220 kB of app.wasm and
# gain nothing measurable; the numerical core, the codec and the plots keep it.
#
# Likewise the library code that runs once or never in the browser: go-app
# (its diff of a frame is not where an edit's time goes), encoding/json, fmt,
# regexp, mime, net/url, log, math/big; and time (a few dates read and
# written at a time).
WASM_GCFLAGS := -gcflags=pairline/app/ui=-l -gcflags=pairline/app/wording=-l -gcflags=pairline/app/store=-l -gcflags=pairline/app/history/view=-l -gcflags=pairline/app/plot=-l \
	-gcflags=github.com/maxence-charriere/go-app/v10/pkg/app=-l -gcflags=encoding/json=-l -gcflags=fmt=-l -gcflags=internal/fmtsort=-l -gcflags=time=-l \
	-gcflags=regexp/...=-l -gcflags=mime/...=-l -gcflags=math/big=-l -gcflags=log=-l -gcflags=net/url=-l
CHROMIUM  ?= $(shell command -v chromium || command -v chromium-browser || true)

.PHONY: all wasm-deps wasm wasm-br wasm-size axe bin run build test fmt-check vet lint unit browser bench bench-fit fuzz refcheck icons clean

all: wasm bin

## wasm-deps: the browser build's copy of go-app without its server, and its go.work (bin/wasmdeps)
wasm-deps:
	$(GO) run ./testdata/wasmdeps -out $(WASMDEPS)

## wasm: compile the app to web/app.wasm
wasm: wasm-deps
	$(WASM_ENV) $(GO) build -trimpath -ldflags="$(WASM_LDFLAGS)" $(WASM_GCFLAGS) -o web/app.wasm ./wasm

## wasm-br: web/app.wasm.br, brotli quality 11 of app.wasm (about a minute of
## a core), which `pairline serve` sends instead of compressing at quality 5 at
## each start (2.08 MB instead of 2.46 MB); a copy of an older build is ignored
wasm-br: wasm
	@command -v brotli >/dev/null || { echo "FAIL: the brotli command is needed (apt-get install brotli)"; exit 1; }
	brotli -q 11 -w 24 -f -o web/app.wasm.br web/app.wasm

## wasm-size: what each package costs in app.wasm (an unstripped build, read by testdata/wasmsize)
wasm-size: wasm-deps
	$(WASM_ENV) $(GO) build -trimpath $(WASM_GCFLAGS) -o bin/app-names.wasm ./wasm
	$(GO) run ./testdata/wasmsize -top 30 bin/app-names.wasm

## bin: build the native command bin/pairline
bin:
	$(GO) build -trimpath -o bin/pairline ./wasm

## run: build everything and serve the app at http://$(ADDR)
run: wasm bin
	./bin/pairline serve --addr $(ADDR)

## build: write the static site to dist/
build: wasm bin
	rm -rf dist
	./bin/pairline build --out dist

## test: formatting, vet, unit tests and browser tests
test: fmt-check vet lint unit browser

fmt-check:
	@out="$$(gofmt -l app fitcore wasm web testdata)"; \
	if [ -n "$$out" ]; then echo "gofmt needed on:"; echo "$$out"; exit 1; fi

vet:
	$(GO) vet ./... ./testdata/wasmdeps/
	GOOS=js GOARCH=wasm $(GO) vet ./wasm ./app/...
	$(GO) vet -tags e2e ./app/e2e/

## lint: staticcheck, native, js/wasm and the browser tests (part of `make test`)
STATICCHECK_VERSION ?= v0.8.2
lint:
	GOBIN="$(CURDIR)/bin" $(GO) install honnef.co/go/tools/cmd/staticcheck@$(STATICCHECK_VERSION)
	@st=0; \
	echo "staticcheck ./... ./testdata/wasmdeps/"; ./bin/staticcheck ./... ./testdata/wasmdeps/ || st=1; \
	echo "GOOS=js GOARCH=wasm staticcheck ./wasm ./app/..."; GOOS=js GOARCH=wasm ./bin/staticcheck ./wasm ./app/... || st=1; \
	echo "staticcheck -tags e2e ./app/e2e/"; ./bin/staticcheck -tags e2e ./app/e2e/ || st=1; \
	exit $$st

unit:
	$(GO) test -count=1 ./... ./testdata/wasmdeps/

## axe: axe-core for the accessibility browser test, from the npm registry,
## checked against its SHA-256 (app/e2e/testdata/axe/README.md); not kept in git
AXE_VERSION ?= 4.14.1
AXE_SHA256  ?= 29348999450cdf2849a8e70b7912fc2da85a849da39c0d0d5394f51d4a9ed95c
AXE_DIR     := app/e2e/testdata/axe
axe: $(AXE_DIR)/axe.min.js
$(AXE_DIR)/axe.min.js:
	@command -v npm >/dev/null || { echo "FAIL: npm is needed to fetch axe-core $(AXE_VERSION) (apt-get install npm)"; exit 1; }
	@tmp="$$(mktemp -d)"; trap 'rm -rf "$$tmp"' EXIT; \
	(cd "$$tmp" && npm pack --silent axe-core@$(AXE_VERSION) >/dev/null && tar -xzf axe-core-$(AXE_VERSION).tgz) || exit 1; \
	echo "$(AXE_SHA256)  $$tmp/package/axe.min.js" | sha256sum -c --quiet - || { echo "FAIL: axe-core $(AXE_VERSION) from npm does not match its checksum"; exit 1; }; \
	cp "$$tmp/package/LICENSE" "$$tmp/package/LICENSE-3RD-PARTY.txt" $(AXE_DIR)/ && cp "$$tmp/package/axe.min.js" $@

## browser: the end-to-end tests in headless Chromium against the real server
browser: wasm-br bin axe
	@chromium="$(CHROMIUM)"; \
	if [ -z "$$chromium" ]; then \
	  if [ "$$CI" = "true" ]; then echo "FAIL: Chromium is not installed, and CI needs the browser tests (.ci/run installs it)"; exit 1; fi; \
	  if [ "$$(id -u)" = "0" ] && command -v apt-get >/dev/null; then \
	    echo "Chromium is missing: installing Debian's chromium"; \
	    apt-get update -q && DEBIAN_FRONTEND=noninteractive apt-get install -y -q chromium || exit 1; \
	    chromium="$$(command -v chromium)"; \
	  else \
	    echo "SKIPPED browser tests: Chromium is not installed (apt-get install chromium, as root)"; exit 0; \
	  fi; \
	fi; \
	PAIRLINE_CHROMIUM="$$chromium" PAIRLINE_BIN="$(CURDIR)/bin/pairline" PAIRLINE_WEB="$(CURDIR)/web" \
	  $(GO) test -count=1 -tags e2e -timeout 20m -v ./app/e2e/

## bench: the benchmarks of the numerical core and the session codec
bench:
	$(GO) test -run '^$$' -bench . -benchmem ./fitcore/ ./app/session/ ./app/plot/ ./app/cli/ ./app/ui/

## bench-fit: time bin/pairline fit (with and without --no-advice) against pandas + statsmodels on a
## generated CSV of N rows (default 10⁶), best of 3 each, and the ratio
bench-fit: bin
	bash testdata/refgen/bench_fit.sh

## fuzz: a short run of every fuzz test (FUZZTIME per target)
FUZZTIME ?= 15s
fuzz:
	@for pkg in $$($(GO) list ./...); do \
	  for f in $$($(GO) test -list '^Fuzz' $$pkg | grep '^Fuzz'); do \
	    echo "fuzz $$pkg $$f"; $(GO) test -run '^$$' -fuzz "^$$f$$" -fuzztime $(FUZZTIME) $$pkg || exit 1; \
	  done; \
	done

## refcheck: regenerate the statsmodels/scipy goldens and compare
refcheck:
	bash testdata/refgen/refcheck.sh

## icons: redraw the app icons
icons:
	$(GO) run web/icons/gen.go

clean:
	rm -rf bin dist web/app.wasm
