import type { Browser, BrowserContext, BrowserContextOptions } from "playwright-core";

/**
 * Everything a browser context saw go wrong: console errors (Chromium reports
 * a Content-Security-Policy violation as one), uncaught page errors, policy
 * violations seen by the page itself, requests that failed, responses of 400
 * and up, and every request to a host other than 127.0.0.1 (each is aborted
 * before it leaves the machine).
 */
export interface WatchLog {
  readonly consoleErrors: string[];
  readonly pageErrors: string[];
  readonly policyViolations: string[];
  readonly failedRequests: string[];
  readonly badResponses: string[];
  readonly outsideRequests: string[];
  /** Every URL answered with a 2xx status, in order. */
  readonly loaded: string[];
}

export interface WatchedContext {
  readonly context: BrowserContext;
  readonly log: WatchLog;
  /** Every recorded problem as one flat list of lines; empty when all went well. */
  problems(): string[];
}

const LOCAL_HOST = "127.0.0.1";

/** Runs in every page before the site's own scripts; the binding reaches back to the test. */
const VIOLATION_LISTENER = `document.addEventListener("securitypolicyviolation", function (e) {
  window.recordPolicyViolation(e.violatedDirective + " blocked " + (e.blockedURI || "inline") + " on " + location.pathname);
});`;

export async function watchedContext(browser: Browser, options: BrowserContextOptions = {}): Promise<WatchedContext> {
  const context = await browser.newContext(options);
  context.setDefaultTimeout(10_000);
  const log: WatchLog = {
    consoleErrors: [],
    pageErrors: [],
    policyViolations: [],
    failedRequests: [],
    badResponses: [],
    outsideRequests: [],
    loaded: [],
  };
  await context.route("**/*", async (route) => {
    const url = new URL(route.request().url());
    if (url.hostname !== LOCAL_HOST) {
      log.outsideRequests.push(url.href);
      await route.abort("blockedbyclient");
      return;
    }
    await route.continue();
  });
  if (options.javaScriptEnabled !== false) {
    await context.exposeFunction("recordPolicyViolation", (text: string) => {
      log.policyViolations.push(text);
    });
    await context.addInitScript({ content: VIOLATION_LISTENER });
  }
  context.on("console", (message) => {
    if (message.type() === "error") log.consoleErrors.push(`${message.text()} (${message.location().url})`);
  });
  context.on("weberror", (error) => {
    log.pageErrors.push(String(error.error()));
  });
  context.on("requestfailed", (request) => {
    const reason = request.failure()?.errorText ?? "failed";
    // the browser fetches the page icon outside the page load and cancels it when the test moves
    // on to the next page: an aborted icon request says nothing about the site
    if (reason === "net::ERR_ABORTED" && request.url().endsWith("/assets/icon.svg")) return;
    log.failedRequests.push(`${request.url()}: ${reason}`);
  });
  context.on("response", (response) => {
    if (response.status() >= 400) log.badResponses.push(`${response.status()} ${response.url()}`);
    else if (response.status() < 300) log.loaded.push(response.url());
  });
  const problems = (): string[] => [
    ...log.consoleErrors.map((s) => `console error: ${s}`),
    ...log.pageErrors.map((s) => `page error: ${s}`),
    ...log.policyViolations.map((s) => `policy violation: ${s}`),
    ...log.failedRequests.map((s) => `failed request: ${s}`),
    ...log.badResponses.map((s) => `bad response: ${s}`),
    ...log.outsideRequests.map((s) => `outside request: ${s}`),
  ];
  return { context, log, problems };
}
