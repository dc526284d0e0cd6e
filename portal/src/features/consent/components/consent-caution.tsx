/** On every consent screen: where questions go before anyone signs. */
export function ConsentCaution() {
  return (
    <p className="rounded-soft border-l-4 border-lagoon bg-paper-raised px-4 py-3 text-fine">
      Questions about this form? Ask the research team or the ethics board named in the form before you sign. Taking
      part is your choice, and you can stop at any time.
    </p>
  );
}
