if (!process.env.TEST_APP_ORIGIN || !process.env.CHROMIUM_PATH) {
  throw new Error("Browser tests need the production build that `npm test` starts: run them with `npm test`.");
}
