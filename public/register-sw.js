// Registers the Bufferwright service worker so the page works offline after one visit.
// Skipped when opened from file:// (the single-file build) or where unsupported.
(function () {
  'use strict';
  if (!('serviceWorker' in navigator)) return;
  if (location.protocol !== 'http:' && location.protocol !== 'https:') return;
  window.addEventListener('load', function () {
    navigator.serviceWorker.register('sw.js', { scope: './' }).catch(function (err) {
      console.warn('Bufferwright: service worker registration failed:', err);
    });
  });
})();
