// Registers the Bufferwright service worker so the page works offline after one visit, and says
// how that went: the root element's data-offline is "pending", "ready", "unsupported" (no service
// worker in this browser or context), "failed" (registration refused) or "file" (not served over
// http(s), e.g. the single file); a "bufferwright-offline" event follows each change. The footer
// line (app/src/offline.rs) shows it, so no engine claims offline use it does not give.
(function () {
  'use strict';
  function report(state) {
    document.documentElement.setAttribute('data-offline', state);
    window.dispatchEvent(new Event('bufferwright-offline'));
  }
  if (location.protocol !== 'http:' && location.protocol !== 'https:') return report('file');
  if (!('serviceWorker' in navigator) || !navigator.serviceWorker) return report('unsupported');
  report('pending');
  window.addEventListener('load', function () {
    navigator.serviceWorker
      .register('sw.js', { scope: './' })
      .then(function () {
        return navigator.serviceWorker.ready;
      })
      .then(
        function () {
          report('ready');
        },
        function (err) {
          console.warn('Bufferwright: service worker registration failed:', err);
          report('failed');
        },
      );
  });
})();
